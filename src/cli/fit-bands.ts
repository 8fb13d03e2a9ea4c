import { RESULT_FORMAT_VERSION, type FitResult } from "../models/fit-result.js";
import { fitJointDetailed, type DetailedJointFit } from "../models/fit-joint.js";
import type { FitOptions } from "../models/fit-options.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { CliIo } from "./cli-io.js";
import type { BandChoice } from "./band-choice.js";
import { fitSummaryText } from "./fit-summary-text.js";
import { samplerProgressBar } from "./progress-bar.js";

/** The JSON of `--bands separate`: one result per band, by band name (an object, never a list). */
export interface PerBandResults {
  readonly formatVersion: number;
  readonly perBand: Readonly<Record<string, FitResult>>;
}

/** Wraps per-band results into the one JSON object of `--bands separate`. */
export function perBandResults(results: readonly FitResult[]): PerBandResults {
  return { formatVersion: RESULT_FORMAT_VERSION, perBand: Object.fromEntries(results.map((r) => [r.data.band ?? "", r])) };
}

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
