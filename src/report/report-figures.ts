import { checkReportInput } from "./check-report-input.js";
import { cornerFigure } from "./corner-figure.js";
import { importanceWeightsFigure } from "./importance-weights-figure.js";
import { lightCurveFigure } from "./light-curve-figure.js";
import { phaseFigure, zoomFigure } from "./periodic-figures.js";
import type { ReportFigure } from "./report-figure.js";
import type { ReportInput } from "./report-input.js";
import { psdFigure } from "./psd-figure.js";
import { spectrumFigure } from "./spectrum-figure.js";
import { traceFigure } from "./trace-figure.js";

/**
 * The figures of a report, in reading order: light curve with prediction (for a model with a period, then
 * the light curve folded at it and a zoom on a few periods; and, for a joint multi-band
 * fit, one panel per band), corner plot, power spectrum
 * (when a periodogram or PSD band is given; for CARMA and DRW fits the one-scale comparison of psd-figure.ts)
 * and chain traces over the whole run (or, for an importance-sampled fit, its weights). Specifications only;
 * nothing is rendered.
 * Throws a RangeError when the input's arrays do not fit together (see {@link checkReportInput}).
 */
export function reportFigures(input: ReportInput): ReportFigure[] {
  checkReportInput(input);
  const spectrum = input.psdComparison ? psdFigure(input) : spectrumFigure(input);
  const bandFigures = (input.bandPanels ?? []).map((panel): ReportFigure => {
    const figure = lightCurveFigure({ ...input, lightCurve: panel.lightCurve, prediction: panel.prediction });
    return { ...figure, id: `light-curve-band-${panel.band}`, title: `Band ${panel.band}: light curve and posterior prediction given every band` };
  });
  const periodic = [phaseFigure(input), zoomFigure(input)].filter((f): f is ReportFigure => f !== undefined);
  return [
    lightCurveFigure(input),
    ...periodic,
    ...bandFigures,
    cornerFigure(input),
    ...(spectrum === undefined ? [] : [spectrum]),
    traceFigure(input),
    importanceWeightsFigure(input),
  ].filter((f): f is ReportFigure => f !== undefined);
}
