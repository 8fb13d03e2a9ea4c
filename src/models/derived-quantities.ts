import type { ModelName } from "./light-curve-model.js";

/** A quantity derived draw by draw from the fitted parameters. */
export interface DerivedQuantity {
  readonly name: string;
  readonly description: string;
  compute(values: Readonly<Record<string, number>>): number;
}

/**
 * The period of a quasi-periodic kernel that carries most of its variance: `period` when
 * harmonicWeight < 1/2 (the fundamental carries 1 - harmonicWeight > 1/2 of it), otherwise period / 2
 * (at exactly 1/2 the two share it equally and the harmonic is reported). This is the quantity to quote
 * as the photometric period, and it removes the exact degeneracy of the kernel: (period, harmonicWeight = 1)
 * and (period / 2, harmonicWeight = 0) are the same kernel.
 */
export function dominantPeriod(period: number, harmonicWeight: number): number {
  return harmonicWeight < 0.5 ? period : period / 2;
}

/**
 * The quality factor of the quasi-periodic kernel's fundamental, read as a driven damped oscillator
 * (Anderson et al. 1990, ApJ 364, 699) with damping rate w0 / (2Q) = 1 / decayTime and damped frequency
 * 2 pi / period: w0 = sqrt((2 pi / period)^2 + 1 / decayTime^2), so
 * Q = w0 decayTime / 2 = sqrt((pi decayTime / period)^2 + 1/4), which is pi decayTime / period to within
 * 1/(8 Q) once the pattern lasts a few periods.
 */
export function fundamentalQuality(period: number, decayTime: number): number {
  return Math.sqrt((Math.PI * decayTime / period) ** 2 + 0.25);
}

/**
 * Quantities astronomers quote besides the fitted parameters:
 * - drw: SF_inf = sqrt(2) sigma, the asymptotic structure function (MacLeod et al. 2010, ApJ 721, 1014), and
 *   with a redshift the rest-frame timescale tau / (1 + z) (time dilation);
 * - oscillator: the coherence (amplitude e-folding) time 2Q / w0 = quality * period / pi;
 * - quasi-periodic: `dominantPeriod` (the function `dominantPeriod` above) and the quality factor of the fundamental
 *   (`fundamentalQuality`); its coherence time is the parameter decayTime itself.
 */
export function derivedQuantities(model: ModelName, redshift?: number): DerivedQuantity[] {
  const out: DerivedQuantity[] = [];
  if (model === "drw") {
    out.push({ name: "sfInf", description: "asymptotic structure function sqrt(2) sigma", compute: (v) => Math.SQRT2 * v.sigma });
    if (redshift !== undefined)
      out.push({ name: "tauRest", description: `rest-frame timescale tau / (1 + ${redshift})`, compute: (v) => v.tau / (1 + redshift) });
  } else if (model === "oscillator") {
    out.push({ name: "coherenceTime", description: "coherence time quality * period / pi", compute: (v) => (v.quality * v.period) / Math.PI });
  } else if (model === "quasi-periodic") {
    out.push(
      {
        name: "dominantPeriod",
        description: "the period carrying most of the variance: period if harmonicWeight < 1/2, else period / 2",
        compute: (v) => dominantPeriod(v.period, v.harmonicWeight),
      },
      {
        name: "quality",
        description: "quality factor of the fundamental, sqrt((pi decayTime / period)^2 + 1/4)",
        compute: (v) => fundamentalQuality(v.period, v.decayTime),
      },
    );
  }
  return out;
}
