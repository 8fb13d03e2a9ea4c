import { parse as parseVega, View } from "vega";
import { compile } from "vega-lite";
import type { ReportFigure } from "./report-figure.js";

/**
 * The SVG text of a figure, rendered headless by Vega from the compiled Vega-Lite specification
 * (renderer "none": no canvas or DOM, so it runs in Node, a page or a Web Worker alike).
 */
export async function renderSvg(figure: ReportFigure): Promise<string> {
  const vegaSpec = compile(figure.spec).spec;
  const view = new View(parseVega(vegaSpec), { renderer: "none" });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}
