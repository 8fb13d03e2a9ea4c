import { mkdir, writeFile } from "node:fs/promises";
import { join } from "node:path";
import { htmlReport } from "./html-report.js";
import { renderFigure, type RenderedFigure } from "./render-figure.js";
import { reportFigures } from "./report-figures.js";
import type { ReportInput } from "./report-input.js";

/** Where {@link writeReport} put things: the page and every figure file (SVG and PNG). */
export interface WrittenReport {
  /** Path of `DIR/report.html`. */
  readonly html: string;
  /** Paths of `DIR/figures/<id>.svg` and `DIR/figures/<id>.png`, in figure order. */
  readonly figures: string[];
}

/**
 * Renders every figure of the report and writes `DIR/report.html` (self-contained) and
 * `DIR/figures/<id>.svg|png`, creating DIR as needed and overwriting earlier files. Node only.
 *
 * @example await writeReport(input, "reports/qss-0042") // { html: "reports/qss-0042/report.html", figures: [...] }
 */
export async function writeReport(input: ReportInput, dir: string): Promise<WrittenReport> {
  const figuresDir = join(dir, "figures");
  await mkdir(figuresDir, { recursive: true });
  const rendered: RenderedFigure[] = [];
  // One at a time: rendering is CPU-bound, so running figures together would only interleave them.
  for (const figure of reportFigures(input)) rendered.push(await renderFigure(figure));
  const paths: string[] = [];
  for (const r of rendered) {
    const svgPath = join(figuresDir, `${r.figure.id}.svg`);
    const pngPath = join(figuresDir, `${r.figure.id}.png`);
    await writeFile(svgPath, r.svg, "utf8");
    await writeFile(pngPath, r.png);
    paths.push(svgPath, pngPath);
  }
  const htmlPath = join(dir, "report.html");
  await writeFile(htmlPath, htmlReport(input, rendered), "utf8");
  return { html: htmlPath, figures: paths };
}
