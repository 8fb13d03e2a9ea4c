import type { Config } from "vega-lite";

/**
 * The font every figure names. DejaVu Sans is installed by `.ci/setup-browser.sh` (Debian's
 * fonts-dejavu-core) so the PNG renderer and the browser draw the same glyphs, Greek letters included.
 */
export const FIGURE_FONT = "DejaVu Sans";

/** Colours shared by the figures, so the same quantity looks the same everywhere. */
export const FIGURE_COLORS = {
  data: "#222222",
  model: "#1f5fa8",
  modelBandInner: "#7fa6d6",
  modelBandOuter: "#c7d8ee",
  periodogram: "#8a8a8a",
  marker: "#c0392b",
  density: "blues",
} as const;

/** The Vega-Lite configuration common to all figures: font, sizes and a light frame. */
export function figureConfig(): Config {
  return {
    font: `${FIGURE_FONT}, Verdana, sans-serif`,
    background: "white",
    padding: 8,
    axis: {
      labelFontSize: 11,
      titleFontSize: 12,
      titleFontWeight: "normal",
      gridColor: "#ececec",
      domainColor: "#666666",
      tickColor: "#666666",
      labelColor: "#333333",
      titleColor: "#111111",
    },
    legend: { labelFontSize: 11, titleFontSize: 11, symbolStrokeWidth: 2, labelLimit: 260 },
    title: { fontSize: 12, fontWeight: "normal", anchor: "start", color: "#111111" },
    view: { stroke: "#999999" },
  };
}
