/**
 * Horologium's browser entry (the `browser` condition of the package's `exports`): everything of the
 * main entry, which uses no Node-only API, plus the parts of the report that run in a page or a Web
 * Worker: the figure specifications, their SVG rendering by Vega, and the self-contained HTML report.
 * What needs Node (writing report files, PNG rasterisation, reading paths, batch worker threads) is
 * left out.
 *
 * @example
 * import { fitLightCurveDetailed, parseLightCurveBytes } from "horologium"; // resolved to this file by a bundler
 * const { lightCurves } = await parseLightCurveBytes(bytes, file.name, "text");
 * const fit = fitLightCurveDetailed(lightCurves[0], { model: "drw", seed: 1 });
 *
 * @module
 */
export * from "./index.js";
export { reportInputFromFit, type ReportSizes } from "./report/report-from-fit.js";
export { reportFigures } from "./report/report-figures.js";
export { renderSvg } from "./report/render-svg.js";
export { htmlReport, reportWarnings, type DrawnFigure, type HtmlReportOptions } from "./report/html-report.js";
export type { ReportFigure } from "./report/report-figure.js";
export type { ReportInput } from "./report/report-input.js";
export { predictionCsv, type PredictionColumns } from "./models/prediction-csv.js";
export { formatFromBytes, formatFromName, type LightCurveFormat } from "./lightcurve/light-curve-format.js";
export { UnrecognisedColumnError } from "./errors/unrecognised-column-error.js";
