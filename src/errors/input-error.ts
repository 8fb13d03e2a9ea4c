/**
 * A problem with the user's input data or options. The command line prints `message` as a single line
 * on stderr and exits non-zero, with no stack trace. The message always names the file and, when known,
 * the line (text files: 1-based file line) or the row (Parquet and FITS tables: 1-based row) and the column.
 *
 * @example throw new InputError("'abc' is not a number", { file: "lc.csv", line: 12, column: "mag" });
 */
export class InputError extends Error {
  readonly file?: string;
  readonly line?: number;
  /** The 1-based table row, for binary tables (Parquet, FITS) that have no text lines. */
  readonly row?: number;
  readonly column?: string;

  constructor(problem: string, where: { file?: string; line?: number; row?: number; column?: string } = {}) {
    super(formatInputProblem(problem, where));
    this.name = "InputError";
    this.file = where.file;
    this.line = where.line;
    this.row = where.row;
    this.column = where.column;
  }
}

/**
 * Formats `file:line: column "name": problem` (or `file: row N: column "name": problem` for binary
 * tables), leaving out the parts that are not known.
 */
export function formatInputProblem(
  problem: string,
  where: { file?: string; line?: number; row?: number; column?: string },
): string {
  let location = where.file ?? "";
  if (where.line !== undefined) location += `${location ? ":" : "line "}${where.line}`;
  else if (where.row !== undefined) location += `${location ? ": " : ""}row ${where.row}`;
  const column = where.column !== undefined ? `column "${where.column}": ` : "";
  return `${location ? location + ": " : ""}${column}${problem}`;
}
