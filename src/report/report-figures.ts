import { checkReportInput } from "./check-report-input.js";
import { cornerFigure } from "./corner-figure.js";
import { lightCurveFigure } from "./light-curve-figure.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { spectrumFigure } from "./spectrum-figure.js";
import { traceFigure } from "./trace-figure.js";

/**
 * The figures of a report, in reading order: light curve with prediction, corner plot, power spectrum
 * (when a periodogram or PSD band is given) and chain traces. Specifications only; nothing is rendered.
 * Throws a RangeError when the input's arrays do not fit together (see {@link checkReportInput}).
 */
export function reportFigures(input: ReportInput): ReportFigure[] {
  checkReportInput(input);
  const spectrum = spectrumFigure(input);
  return [
    lightCurveFigure(input),
    cornerFigure(input),
    ...(spectrum === undefined ? [] : [spectrum]),
    traceFigure(input),
  ];
}
