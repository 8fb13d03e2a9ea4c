import { fitJointDetailed, type DetailedJointFit } from "../models/fit-joint.js";
import type { FitOptions } from "../models/fit-options.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { CliIo } from "./cli-io.js";
import type { BandChoice } from "./band-choice.js";
import { fitSummaryText } from "./fit-summary-text.js";
import { samplerProgressBar } from "./progress-bar.js";

export { perBandResults, type PerBandResults } from "../models/per-band-results.js";

/** The joint fit of every band with a progress bar and the summary on stderr. */
export function fitJointWithProgress(
  lightCurves: readonly LightCurve[],
  options: FitOptions,
  choice: Extract<BandChoice, { kind: "joint" }>,
  io: CliIo,
  quiet: boolean,
): DetailedJointFit {
  const bar = samplerProgressBar(io, quiet, `fitting ${lightCurves.length} bands jointly`);
  let fit;
  try {
    fit = fitJointDetailed(lightCurves, {
      ...options,
      ...(choice.lags ? { lags: true } : {}),
      ...(choice.referenceBand !== undefined ? { referenceBand: choice.referenceBand } : {}),
      ...(bar.onProgress ? { onProgress: bar.onProgress } : {}),
      clock: io.now,
    });
  } finally {
    bar.stop();
  }
  if (!quiet) io.stderr(fitSummaryText(fit.result));
  return fit;
}
