import { Resvg } from "@resvg/resvg-js";
import { FIGURE_FONT } from "./figure-style.js";
import type { ReportFigure } from "./report-figure.js";
import { renderSvg } from "./render-svg.js";

export { renderSvg };

/** A figure drawn: its SVG text, its PNG bytes and the pixel size of each. */
export interface RenderedFigure {
  readonly figure: ReportFigure;
  readonly svg: string;
  readonly png: Uint8Array;
  /** SVG size in CSS pixels. */
  readonly width: number;
  readonly height: number;
  /** PNG size in device pixels (the SVG size times `pngScale`). */
  readonly pngWidth: number;
  readonly pngHeight: number;
}

/** Options of {@link renderFigure}. */
export interface RenderOptions {
  /** PNG pixels per SVG pixel (default 2, sharp on high-density screens and in print). */
  readonly pngScale?: number;
}

/**
 * Compiles a figure's Vega-Lite specification to Vega, renders it headless to SVG with a Vega View
 * (renderer "none", no canvas or DOM), then rasterises the SVG to PNG with resvg using the system fonts.
 */
export async function renderFigure(figure: ReportFigure, options: RenderOptions = {}): Promise<RenderedFigure> {
  const svg = await renderSvg(figure);
  const scale = options.pngScale ?? 2;
  const resvg = new Resvg(svg, {
    fitTo: { mode: "zoom", value: scale },
    background: "white",
    font: { loadSystemFonts: true, defaultFontFamily: FIGURE_FONT, sansSerifFamily: FIGURE_FONT },
  });
  const image = resvg.render();
  const png = new Uint8Array(image.asPng());
  return {
    figure,
    svg,
    png,
    width: resvg.width,
    height: resvg.height,
    pngWidth: image.width,
    pngHeight: image.height,
  };
}
