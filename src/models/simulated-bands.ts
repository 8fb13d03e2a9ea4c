import { GaussianProcess } from "../gp/gaussian-process.js";
import type { Kernel } from "../kernels/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { photometricError } from "../lightcurve/photometric-error.js";
import type { Rng } from "../random/rng.js";

/** One simulated band: how it sees the shared process and how deep its exposures are. */
export interface SimulatedBand {
  readonly name: string;
  /** a_b: response to the shared process (the reference band has 1). */
  readonly amplitude: number;
  /** m_b: mean magnitude. */
  readonly mean: number;
  /** l_b: the band sees the process at t - lag (days). Default 0. */
  readonly lag?: number;
  /** Single-visit 5-sigma depth (Ivezic et al. 2019, eq. 5), magnitudes. */
  readonly depth5Sigma: number;
}

/**
 * Interleaved multi-band light curves of one shared process: the visits (sorted times) go to the bands in
 * turn, visit k to band k mod B, as a survey that changes filter between visits; the latent process is
 * drawn once at every band's shifted times t - lag_b, and band b records m_b + a_b f(t - lag_b) plus
 * Gaussian noise with the per-visit error of its depth. Magnitudes; for tests, benchmarks and demos.
 */
export function simulateInterleavedBands(
  kernel: Kernel,
  visits: ArrayLike<number>,
  bands: readonly SimulatedBand[],
  rng: Rng,
  source = "simulated",
): LightCurve[] {
  const count = bands.length;
  const band = Int32Array.from({ length: visits.length }, (_, k) => k % count);
  const shifted = Float64Array.from(visits, (t, k) => t - (bands[band[k]].lag ?? 0));
  const order = Int32Array.from(shifted.keys()).sort((i, j) => shifted[i] - shifted[j]);
  const latent = new GaussianProcess(kernel, Float64Array.from(order, (i) => shifted[i])).priorDraw(rng);
  const atVisit = new Float64Array(visits.length);
  order.forEach((i, k) => (atVisit[i] = latent[k]));
  return bands.map((b, index) => {
    const time: number[] = [];
    const value: number[] = [];
    const error: number[] = [];
    for (let k = 0; k < visits.length; k++) {
      if (band[k] !== index) continue;
      const truth = b.mean + b.amplitude * atVisit[k];
      const e = photometricError(truth, { depth5Sigma: b.depth5Sigma });
      time.push(visits[k]);
      value.push(truth + e * rng.normal());
      error.push(e);
    }
    return {
      time: Float64Array.from(time),
      value: Float64Array.from(value),
      error: Float64Array.from(error),
      unit: "mag" as const,
      band: b.name,
      provenance: { source, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
    };
  });
}
