/**
 * The report layer: figures of a fit rendered with Vega-Lite and resvg, and the self-contained HTML
 * report. `writeReport` and `renderFigure` need Node; the figure specifications and `htmlReport` do not.
 */
export type {
  NumericColumn,
  ParameterDisplay,
  PeriodogramCurve,
  PosteriorDraws,
  PredictiveCurve,
  PsdBand,
  ReportInput,
} from "./report-input.js";
export type { ReportFigure } from "./report-figure.js";
export { lightCurveFigure } from "./light-curve-figure.js";
export { cornerFigure } from "./corner-figure.js";
export { spectrumFigure, spectrumMarkers, type FrequencyMarker } from "./spectrum-figure.js";
export { traceFigure } from "./trace-figure.js";
export { importanceWeightsFigure } from "./importance-weights-figure.js";
export { reportFigures } from "./report-figures.js";
export { checkReportInput } from "./check-report-input.js";
export { renderFigure, renderSvg, type RenderedFigure, type RenderOptions } from "./render-figure.js";
export { htmlReport, reportWarnings, type DrawnFigure } from "./html-report.js";
export { plainSummary } from "./plain-summary.js";
export { formatMeasurement, formatSignificant } from "./format-measurement.js";
export { writeReport, type WrittenReport } from "./write-report.js";
