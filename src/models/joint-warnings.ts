import type { LightCurve } from "../lightcurve/light-curve.js";
import type { ParameterSummary } from "./fit-result.js";
import type { JointModel } from "./joint-model.js";

const fmt = (x: number) => (Math.abs(x) >= 1e4 || (x !== 0 && Math.abs(x) < 1e-2) ? x.toExponential(2) : x.toPrecision(3));

/**
 * A lag counts as resolved when the data narrow its prior: its 68% interval is less than half the
 * width the uniform prior's 68% interval would have (0.68 of the prior's full width). Common practice:
 * a posterior close to its prior is not a measurement.
 */
export const LAG_RESOLUTION_FRACTION = 0.5;

/**
 * Warnings of a joint fit: a lag the sampling does not resolve (its posterior is close to the prior: the
 * bands' visits are too sparse or too far apart for it), and a band with far fewer points than the
 * reference (its amplitude and mean then rest mostly on the prior of the shared process).
 */
export function jointWarnings(
  model: JointModel,
  lightCurves: readonly LightCurve[],
  parameters: Readonly<Record<string, ParameterSummary>>,
): string[] {
  const warnings: string[] = [];
  if (model.lags) {
    const priorWidth = 0.68 * 2 * model.lagRange;
    model.bands.forEach((band, b) => {
      if (b === model.reference) return;
      const s = parameters[`lag.${band}`];
      if (!s) return;
      const width = s.q84 - s.q16;
      if (!(width < LAG_RESOLUTION_FRACTION * priorWidth))
        warnings.push(
          `lag.${band} is not resolved by the sampling: its 68% interval (${fmt(s.q16)} to ${fmt(s.q84)}) is close to the prior's ` +
            `(+-${fmt(model.lagRange)}); the bands' visits do not constrain it.`,
        );
    });
  }
  const referencePoints = lightCurves[model.reference].time.length;
  lightCurves.forEach((lc, b) => {
    if (lc.time.length < 10 && lc.time.length * 5 < referencePoints)
      warnings.push(`Band ${model.bands[b]} has only ${lc.time.length} points: its amplitude and mean are poorly constrained.`);
  });
  return warnings;
}
