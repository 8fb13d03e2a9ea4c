/**
 * The notebook format. A notebook is an ordinary TypeScript module (it type-checks and runs as it is);
 * its prose sits in block comments that open with `/* md` on a line of their own and close with a line
 * holding only the comment terminator. Everything between two prose blocks is one code cell; a line
 * `// %%` splits a code cell in two. The runner injects a marker before each code cell so that the
 * output a cell prints or draws is shown under that cell.
 */

/** One cell of a notebook, in source order. */
export type NotebookCell =
  | { readonly kind: "markdown"; readonly text: string }
  | { readonly kind: "code"; readonly index: number; readonly text: string; readonly firstLine: number; readonly lastLine: number };

const PROSE_OPEN = /^\/\*\s*md\s*$/;
const PROSE_CLOSE = /^\s*\*\/\s*$/;
const CODE_SPLIT = /^\/\/\s*%%\s*$/;

/**
 * Splits a notebook's source into prose and code cells. Code cells are numbered from 0; blank code cells
 * (only whitespace) are dropped. Line numbers are 0-based indices into the source lines.
 */
export function notebookCells(source: string): NotebookCell[] {
  const lines = source.replace(/\r\n?/g, "\n").split("\n");
  const cells: NotebookCell[] = [];
  let code: string[] = [];
  let codeStart = 0;
  let index = 0;
  const closeCode = (end: number) => {
    // Trim blank lines at both ends but keep the line numbers of what remains.
    let first = 0;
    let last = code.length - 1;
    while (first <= last && code[first].trim() === "") first++;
    while (last >= first && code[last].trim() === "") last--;
    if (first <= last) {
      cells.push({
        kind: "code",
        index: index++,
        text: code.slice(first, last + 1).join("\n"),
        firstLine: codeStart + first,
        lastLine: codeStart + last,
      });
    }
    code = [];
    codeStart = end;
  };
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    if (PROSE_OPEN.test(line)) {
      closeCode(i);
      const prose: string[] = [];
      i++;
      while (i < lines.length && !PROSE_CLOSE.test(lines[i])) prose.push(lines[i++]);
      if (i >= lines.length) throw new SyntaxError(`notebook: the prose block opened on line ${codeStart + 1} is never closed`);
      cells.push({ kind: "markdown", text: dedent(prose).join("\n") });
      codeStart = i + 1;
      continue;
    }
    if (CODE_SPLIT.test(line)) {
      closeCode(i);
      codeStart = i + 1;
      continue;
    }
    code.push(line);
  }
  closeCode(lines.length);
  return cells;
}

/**
 * The executable form of a notebook: its source with a `beginCell(k)` call placed on the line before
 * each code cell and a final `finishNotebook(...)` call, so that outputs land under the right cell.
 * Relative module specifiers (`"./..."`, `"../..."`) are passed through `resolveSpecifier`, so that the
 * executable copy can live outside the notebooks folder (the runner writes it under `out/`).
 * Every line keeps its number, so stack traces point into the source.
 */
export function instrumentNotebook(
  source: string,
  kitModule: string,
  sourcePath: string,
  outDir: string,
  resolveSpecifier: (specifier: string) => string = (specifier) => specifier,
): string {
  const lines = source.replace(/\r\n?/g, "\n").split("\n");
  const cells = notebookCells(source);
  const inserted = new Map<number, string>();
  for (const cell of cells) if (cell.kind === "code") inserted.set(cell.firstLine, `__beginCell(${cell.index}); `);
  const prose = new Set<number>();
  for (let i = 0, inProse = false; i < lines.length; i++) {
    if (!inProse && PROSE_OPEN.test(lines[i])) inProse = true;
    if (inProse) prose.add(i);
    if (inProse && i > 0 && PROSE_CLOSE.test(lines[i])) inProse = false;
  }
  const relative = /(\bfrom\s*|\bimport\s*\(?\s*)(["'])(\.{1,2}\/[^"']+)\2/g;
  const body = lines.map((line, i) => {
    const code = prose.has(i) ? line : line.replace(relative, (_, head: string, quote: string, specifier: string) => `${head}${quote}${resolveSpecifier(specifier)}${quote}`);
    return (inserted.get(i) ?? "") + code;
  });
  // The kit's import shares the first line, so every line keeps its number and stack traces point into the source.
  body[0] = `import { beginCell as __beginCell, finishNotebook as __finishNotebook } from ${JSON.stringify(kitModule)}; ${body[0]}`;
  return [...body, `await __finishNotebook(${JSON.stringify(sourcePath)}, ${JSON.stringify(outDir)});`, ""].join("\n");
}

function dedent(lines: string[]): string[] {
  const indents = lines.filter((l) => l.trim() !== "").map((l) => /^\s*/.exec(l)![0].length);
  const cut = indents.length > 0 ? Math.min(...indents) : 0;
  return lines.map((l) => l.slice(cut));
}
