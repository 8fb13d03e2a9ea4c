/**
 * What a running notebook shows: printed text (console.log inside a cell), tables and figures. The
 * runner places `beginCell(k)` before each code cell, so every output is filed under the cell that made
 * it, and `finishNotebook` at the end, which renders the figures and writes the HTML page.
 *
 * This module holds the one notebook being run in this process (the runner starts a process per
 * notebook); library code never sees it.
 */
import { mkdir, readFile, writeFile } from "node:fs/promises";
import { basename, join } from "node:path";
import { format } from "node:util";
import { compile, type TopLevelSpec } from "vega-lite";
import { renderFigure, type RenderedFigure } from "../../src/report/render-figure.js";
import { notebookCells } from "./notebook-cells.js";
import { notebookPage, type CellOutput } from "./notebook-page.js";

/** A figure to draw: a Vega-Lite specification and the sentence under it. */
export interface NotebookFigure {
  /** File-name-safe identifier, unique within the notebook: the PNG and SVG files are `<id>.png|svg`. */
  readonly id: string;
  /** What is drawn and what to look at; shown under the figure. */
  readonly caption: string;
  readonly spec: TopLevelSpec;
}

/** A table row: column name to value (numbers are printed as given; format them first). */
export type TableRow = Readonly<Record<string, string | number | boolean>>;

interface Recorder {
  cell: number;
  readonly outputs: Map<number, CellOutput[]>;
  readonly figures: Promise<RenderedFigure>[];
  readonly seconds: Map<number, number>;
  cellStart: number;
  readonly started: number;
}

const recorder: Recorder = {
  cell: -1,
  outputs: new Map(),
  figures: [],
  seconds: new Map(),
  cellStart: performance.now(),
  started: performance.now(),
};

function push(output: CellOutput): void {
  const list = recorder.outputs.get(recorder.cell) ?? [];
  list.push(output);
  recorder.outputs.set(recorder.cell, list);
}

const terminalLog = console.log.bind(console);
console.log = (...values: unknown[]) => push({ kind: "text", text: format(...values) });

/** Marks the start of code cell `index` (placed by the runner; notebooks do not call it). */
export function beginCell(index: number): void {
  const now = performance.now();
  if (recorder.cell >= 0) recorder.seconds.set(recorder.cell, (now - recorder.cellStart) / 1000);
  recorder.cell = index;
  recorder.cellStart = now;
  process.stderr.write(`  cell ${index}\n`);
}

/**
 * Shows a table under the current cell. Columns are the keys of the first row, in order.
 *
 * @example table([{ parameter: "tau", median: "118 d" }])
 */
export function table(rows: readonly TableRow[], caption = ""): void {
  push({ kind: "table", rows, caption });
}

/**
 * Draws a figure under the current cell. Rendering (Vega-Lite to SVG, then PNG) runs in the
 * background; `finishNotebook` waits for it.
 */
export function figure(item: NotebookFigure): void {
  // Compile now, so that a broken specification fails in the cell that made it, naming the figure.
  try {
    compile(item.spec);
  } catch (error) {
    throw new Error(`figure "${item.id}": the Vega-Lite specification does not compile: ${error instanceof Error ? error.message : String(error)}`);
  }
  const rendered = renderFigure({ id: item.id, title: item.id, caption: item.caption, spec: item.spec });
  rendered.catch(() => undefined); // reported by finishNotebook
  recorder.figures.push(rendered);
  push({ kind: "figure", id: item.id, caption: item.caption });
}

/**
 * Renders every figure, writes `<outDir>/<name>.html` and `<outDir>/<name>/<id>.svg|png|vl.json` (the
 * last is the Vega-Lite specification with its data, to reuse the figure elsewhere), and prints a
 * one-line summary (name, seconds, figures) on the terminal for the runner.
 */
export async function finishNotebook(sourcePath: string, outDir: string): Promise<void> {
  const now = performance.now();
  if (recorder.cell >= 0) recorder.seconds.set(recorder.cell, (now - recorder.cellStart) / 1000);
  const name = basename(sourcePath).replace(/\.ts$/, "");
  const figures = await Promise.all(recorder.figures);
  const figureDir = join(outDir, name);
  await mkdir(figureDir, { recursive: true });
  const ids = new Set<string>();
  for (const f of figures) {
    if (ids.has(f.figure.id)) throw new Error(`notebook ${name}: two figures have the id "${f.figure.id}"`);
    ids.add(f.figure.id);
    await writeFile(join(figureDir, `${f.figure.id}.svg`), f.svg, "utf8");
    await writeFile(join(figureDir, `${f.figure.id}.png`), f.png);
    await writeFile(join(figureDir, `${f.figure.id}.vl.json`), JSON.stringify(f.figure.spec), "utf8");
  }
  const source = await readFile(sourcePath, "utf8");
  const seconds = (performance.now() - recorder.started) / 1000;
  const html = notebookPage({
    name,
    cells: notebookCells(source),
    outputs: recorder.outputs,
    cellSeconds: recorder.seconds,
    figures: new Map(figures.map((f) => [f.figure.id, f.svg])),
    seconds,
  });
  await writeFile(join(outDir, `${name}.html`), html, "utf8");
  terminalLog(JSON.stringify({ notebook: name, seconds, figures: figures.length, html: join(outDir, `${name}.html`) }));
}
