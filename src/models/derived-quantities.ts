import type { ModelName } from "./light-curve-model.js";

/** A quantity derived draw by draw from the fitted parameters. */
export interface DerivedQuantity {
  readonly name: string;
  readonly description: string;
  compute(values: Readonly<Record<string, number>>): number;
}

/**
 * Quantities astronomers quote besides the fitted parameters:
 * - drw: SF_inf = sqrt(2) sigma, the asymptotic structure function (MacLeod et al. 2010, ApJ 721, 1014), and
 *   with a redshift the rest-frame timescale tau / (1 + z) (time dilation);
 * - oscillator and quasi-periodic: the coherence (amplitude e-folding) time 2Q / w0 = quality * period / pi
 *   of the damped oscillator (for the quasi-periodic kernel, of its fundamental up to the factor eta).
 */
export function derivedQuantities(model: ModelName, redshift?: number): DerivedQuantity[] {
  const out: DerivedQuantity[] = [];
  if (model === "drw") {
    out.push({ name: "sfInf", description: "asymptotic structure function sqrt(2) sigma", compute: (v) => Math.SQRT2 * v.sigma });
    if (redshift !== undefined)
      out.push({ name: "tauRest", description: `rest-frame timescale tau / (1 + ${redshift})`, compute: (v) => v.tau / (1 + redshift) });
  } else {
    out.push({ name: "coherenceTime", description: "coherence time quality * period / pi", compute: (v) => (v.quality * v.period) / Math.PI });
  }
  return out;
}
