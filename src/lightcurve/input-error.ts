/**
 * A problem with the user's input data or options. The command line prints `message` as a single line
 * on stderr and exits non-zero, with no stack trace. The message always names the file and, when known,
 * the line and the column.
 *
 * @example throw new InputError("'abc' is not a number", { file: "lc.csv", line: 12, column: "mag" });
 */
export class InputError extends Error {
  readonly file?: string;
  readonly line?: number;
  readonly column?: string;

  constructor(problem: string, where: { file?: string; line?: number; column?: string } = {}) {
    super(formatInputProblem(problem, where));
    this.name = "InputError";
    this.file = where.file;
    this.line = where.line;
    this.column = where.column;
  }
}

/** Formats `file:line: column "name": problem`, leaving out the parts that are not known. */
export function formatInputProblem(
  problem: string,
  where: { file?: string; line?: number; column?: string },
): string {
  let location = where.file ?? "";
  if (where.line !== undefined) location += `${location ? ":" : "line "}${where.line}`;
  const column = where.column !== undefined ? `column "${where.column}": ` : "";
  return `${location ? location + ": " : ""}${column}${problem}`;
}
