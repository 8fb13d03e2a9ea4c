import { parse as parseVega, View } from "vega";
import { compile } from "vega-lite";
import type { ReportFigure } from "./report-figure.js";

/** A number of an SVG geometry attribute with three or more decimals (Vega writes full double precision). */
const LONG_DECIMAL = /-?\d+\.\d{3,}(?:e[-+]?\d+)?/g;
/** Geometry attributes whose numbers are pixel positions. */
const GEOMETRY_ATTRIBUTE = / (d|transform|points)="([^"]*)"/g;

/**
 * Geometry rounded to 1/100 of a pixel, far below what any screen or print shows: Vega writes every
 * coordinate with full double precision, which is a third of the text of a figure with thousands of points.
 */
export function roundedGeometry(svg: string): string {
  return svg.replace(GEOMETRY_ATTRIBUTE, (_, name: string, value: string) => ` ${name}="${value.replace(LONG_DECIMAL, (x) => String(Math.round(Number(x) * 100) / 100))}"`);
}

/**
 * The SVG text of a figure, rendered headless by Vega from the compiled Vega-Lite specification
 * (renderer "none": no canvas or DOM, so it runs in Node, a page or a Web Worker alike), its geometry
 * rounded ({@link roundedGeometry}).
 */
export async function renderSvg(figure: ReportFigure): Promise<string> {
  const vegaSpec = compile(figure.spec).spec;
  const view = new View(parseVega(vegaSpec), { renderer: "none" });
  try {
    return roundedGeometry(await view.toSVG());
  } finally {
    view.finalize();
  }
}
