import { InputError } from "../errors/input-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { fitLightCurveDetailed, type DetailedFit } from "../models/fit-light-curve.js";
import type { FitOptions } from "../models/fit-options.js";
import type { FitResult } from "../models/fit-result.js";
import type { CliIo } from "./cli-io.js";
import { fitSummaryText } from "./fit-summary-text.js";
import { samplerProgressBar } from "./progress-bar.js";

/** With `--robust`, every light curve needs an error column (the Student-t noise scales each point's error). */
export function requireErrorsForRobust(lightCurves: readonly LightCurve[], options: Pick<FitOptions, "robust">, file: string): void {
  if (options.robust && lightCurves.some((lightCurve) => !lightCurve.error))
    throw new InputError("--robust needs an error column (the Student-t noise scales each point's error)", { file });
}

/** Fits one light curve with a progress bar labelled `label` ("fitting", or "fitting band B" for band B) and, unless quiet, the summary on stderr. */
export function fitWithProgress(lightCurve: LightCurve, options: FitOptions, io: CliIo, quiet: boolean, label = lightCurve.band ? `fitting band ${lightCurve.band}` : "fitting"): DetailedFit {
  const bar = samplerProgressBar(io, quiet, label);
  let fit;
  try {
    fit = fitLightCurveDetailed(lightCurve, { ...options, ...(bar.onProgress ? { onProgress: bar.onProgress } : {}), clock: io.now });
  } finally {
    bar.stop();
  }
  if (!quiet) io.stderr(fitSummaryText(fit.result));
  return fit;
}

/**
 * Fits every light curve of the input (one per band) with a progress bar and the summary on stderr, and
 * hands each fit to `onFitted` (reports, forecasts). Used by fit and demo.
 */
export async function fitAll(
  lightCurves: readonly LightCurve[],
  options: FitOptions,
  io: CliIo,
  quiet: boolean,
  onFitted?: (lightCurve: LightCurve, fit: DetailedFit) => Promise<void>,
): Promise<FitResult[]> {
  const results: FitResult[] = [];
  for (const lightCurve of lightCurves) {
    const fit = fitWithProgress(lightCurve, options, io, quiet);
    if (onFitted) await onFitted(lightCurve, fit);
    results.push(fit.result);
  }
  return results;
}
