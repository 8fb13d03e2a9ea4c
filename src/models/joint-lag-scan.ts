import { MultiBandProcess } from "../gp/multi-band-process.js";
import { FactorizationError } from "../linalg/factorization-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { JointModel } from "./joint-model.js";

/** Lags tried per band across the lag prior (step: the prior's width / (LAG_SCAN_STEPS - 1)). */
export const LAG_SCAN_STEPS = 401;

/**
 * First guesses of the lags, band by band: the lag of band b that maximises the likelihood of the
 * reference band and band b together (their means integrated out), the shared process at its first
 * guess (or at `at`: a joint fit scans again at the first maximum it found), on a grid across the lag prior.
 *
 * Why: for interleaved bands the likelihood in the lags is rugged: a shift of a day moves a band's
 * points past its neighbours in the other bands, and with errors below the process's change over a day
 * the likelihood has local maxima days apart (on the six-band quasars of bench/multi-band-fit.ts, lags
 * of 2-8 d: ln L 804 at the truth, 699 at a quarter of it, 518 at half). A local mode search from lags of
 * zero stops in one of them; the scan finds the global one per band at the cost of a few thousand
 * evaluations of two bands. At the first guess of the kernel (tau three times the truth, say) the scan
 * can miss by a day, and the mode search then stops in a lesser lag mode (on 3 of 20 calibration
 * quasars of bench/multi-band-calibration.ts --lags --seed 17, ln p 27-66 below the mode near the true
 * lags); scanned again at the kernel and amplitudes of that first maximum, it put the second search
 * there in all three (bench/README.md).
 */
export function lagScanGuess(model: JointModel, lightCurves: readonly LightCurve[], at: Readonly<Record<string, number>> = model.initialGuess): Record<string, number> {
  const guess: Record<string, number> = {};
  if (!model.lags) return guess;
  const initial = model.space.physicalFromRecord({ ...model.initialGuess, ...at });
  const kernel = model.kernelAt(initial);
  const { amplitude, jitter } = model.bandParametersAt(initial);
  const reference = model.reference;
  const priorOf = (b: number) => {
    const spec = model.space.specs.find((s) => s.name === `mean.${model.bands[b]}`);
    const settings = spec?.prior?.settings;
    return { mean: settings?.mean ?? 0, sd: settings?.sd ?? 1 };
  };
  const bandOf = (b: number) => {
    const lc = lightCurves[b];
    return { name: model.bands[b], time: lc.time, values: lc.value, errors: lc.error ?? 0 };
  };
  const step = (2 * model.lagRange) / (LAG_SCAN_STEPS - 1);
  model.bands.forEach((name, b) => {
    if (b === reference) return;
    const pair = { amplitude: [1, amplitude[b] ?? 1], mean: [0, 0], jitter: [jitter?.[reference] ?? 0, jitter?.[b] ?? 0] };
    const priors = [priorOf(reference), priorOf(b)];
    const base = new MultiBandProcess(kernel, [bandOf(reference), bandOf(b)], { ...pair, lag: [0, 0] });
    let best = 0;
    let bestValue = -Infinity;
    for (let k = 0; k < LAG_SCAN_STEPS; k++) {
      const lag = -model.lagRange + k * step;
      let value: number;
      try {
        value = base.withParameters(kernel, { ...pair, lag: [0, lag] }).meanMarginal(priors).logLikelihood;
      } catch (error) {
        if (!(error instanceof FactorizationError)) throw error;
        value = -Infinity;
      }
      if (value > bestValue) {
        bestValue = value;
        best = lag;
      }
    }
    guess[`lag.${name}`] = best;
  });
  return guess;
}
