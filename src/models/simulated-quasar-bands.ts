import { kernels } from "../kernels/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { seasonalGroundCadence } from "../lightcurve/cadence.js";
import type { Rng } from "../random/rng.js";
import { simulateInterleavedBands } from "./simulated-bands.js";

/** The six bands of the simulated quasars, shortest wavelength first. */
export const QUASAR_BAND_NAMES = ["u", "g", "r", "i", "z", "y"] as const;

/** Single-visit 5-sigma depths of the six bands (magnitudes; invented, deepest in g). */
const QUASAR_DEPTHS = [23.5, 24.5, 24.3, 23.9, 23.3, 22.5];

/** A simulated six-band quasar and the truths it was drawn from. */
export interface SimulatedQuasar {
  /** DRW timescale (days) and amplitude in g (magnitudes). */
  readonly tau: number;
  readonly sigma: number;
  /** Per band (in `QUASAR_BAND_NAMES` order): amplitude relative to g, and lag relative to g (days; 0 without lags). */
  readonly amplitudes: readonly number[];
  readonly lags: readonly number[];
  readonly lightCurves: LightCurve[];
}

const logUniform = (u: number, lo: number, hi: number) => lo * Math.exp(u * Math.log(hi / lo));

/**
 * An interleaved six-band quasar of the invented survey (the calibration set of
 * bench/multi-band-calibration.ts): three seasons of one visit a night, 30% lost to weather, the first 360
 * visits shared out among the bands in turn; per-band depths; one damped random walk with tau log-uniform
 * on 50-600 d and sigma log-uniform on 0.1-0.3 mag in g; amplitudes (1.3 - 0.12 b t) / (1.3 - 0.12 t)
 * relative to g, falling with wavelength by a tilt t uniform on 0.7-1.3; means 20 - 0.1 b mag; with
 * `lags`, band b follows g by (b - 1)(1 + 0.6 U) d (u leads by 1-1.6 d, y follows by 5-8 d). Every
 * random choice from `rng`, in that order.
 */
export function simulatedSixBandQuasar(rng: Rng, options: { readonly lags?: boolean; readonly source?: string } = {}): SimulatedQuasar {
  const tau = logUniform(rng.uniform(), 50, 600);
  const sigma = logUniform(rng.uniform(), 0.1, 0.3);
  const tilt = 0.7 + 0.6 * rng.uniform();
  const amplitudes = QUASAR_BAND_NAMES.map((_, b) => (1.3 - 0.12 * b * tilt) / (1.3 - 0.12 * tilt));
  const lags = QUASAR_BAND_NAMES.map((_, b) => (options.lags ? (b - 1) * (1 + 0.6 * rng.uniform()) : 0));
  const visits = seasonalGroundCadence({ seasons: 3, revisitInterval: 1, weatherLoss: 0.3 }, rng).slice(0, 360);
  const bands = QUASAR_BAND_NAMES.map((name, b) => ({ name, amplitude: amplitudes[b], mean: 20 - 0.1 * b, depth5Sigma: QUASAR_DEPTHS[b], lag: lags[b] }));
  const lightCurves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma, tau }), visits, bands, rng, options.source ?? "simulated");
  return { tau, sigma, amplitudes, lags, lightCurves };
}
