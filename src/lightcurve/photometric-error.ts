/**
 * Photometric errors of a ground-based imaging survey as a function of magnitude and single-visit
 * 5-sigma depth, after Ivezic et al. 2019 (ApJ 873, 111), eqs. 4 and 5.
 */

/**
 * The systematic error floor per visit, in magnitudes: sigma_sys = 0.005 mag (Ivezic et al. 2019, eq. 4
 * and the text after it; a design goal there, used here as a sensible default).
 */
export const DEFAULT_SYSTEMATIC_FLOOR = 0.005;

/**
 * The band-dependent parameter gamma of Ivezic et al. 2019 eq. 5, for the red (r) band: 0.039
 * (their Table 2; from memory). It is 0.037-0.039 in every band, so the default serves for all.
 */
export const DEFAULT_GAMMA = 0.039;

/**
 * Random photometric error of one visit, in magnitudes (Ivezic et al. 2019, eq. 5):
 * sigma_rand^2 = (0.04 - gamma) x + gamma x^2, with x = 10^(0.4 (m - m5)).
 * At m = m5 this is exactly 0.2 mag (a 5-sigma detection: 1.0857 / 5 ~ 0.2).
 *
 * @param magnitude the source magnitude m
 * @param depth5Sigma the single-visit 5-sigma limiting magnitude m5
 * @param gamma the band parameter (default 0.039)
 * @example randomMagnitudeError(24.5, 24.5) // 0.2
 */
export function randomMagnitudeError(magnitude: number, depth5Sigma: number, gamma = DEFAULT_GAMMA): number {
  const x = Math.pow(10, 0.4 * (magnitude - depth5Sigma));
  return Math.sqrt((0.04 - gamma) * x + gamma * x * x);
}

/** Options of {@link photometricError}. */
export interface PhotometricErrorOptions {
  /** Single-visit 5-sigma limiting magnitude m5. */
  readonly depth5Sigma: number;
  /** Band parameter of Ivezic et al. 2019 eq. 5 (default 0.039). */
  readonly gamma?: number;
  /** Systematic floor in magnitudes, added in quadrature (default 0.005; 0 to leave it out). */
  readonly systematicFloor?: number;
}

/**
 * Total per-visit photometric error in magnitudes: sqrt(sigma_sys^2 + sigma_rand^2), with sigma_rand from
 * `randomMagnitudeError` (Ivezic et al. 2019, eqs. 4-5).
 *
 * @example photometricError(21, { depth5Sigma: 24.5 }) // ~0.0113 mag
 */
export function photometricError(magnitude: number, options: PhotometricErrorOptions): number {
  if (!Number.isFinite(magnitude)) throw new RangeError(`magnitude must be finite, got ${magnitude}`);
  if (!Number.isFinite(options.depth5Sigma)) {
    throw new RangeError(`depth5Sigma must be finite, got ${options.depth5Sigma}`);
  }
  const gamma = options.gamma ?? DEFAULT_GAMMA;
  if (!(gamma >= 0 && gamma <= 0.04)) throw new RangeError(`gamma must lie in [0, 0.04], got ${gamma}`);
  const floor = options.systematicFloor ?? DEFAULT_SYSTEMATIC_FLOOR;
  if (!(floor >= 0)) throw new RangeError(`systematicFloor must be >= 0, got ${floor}`);
  const random = randomMagnitudeError(magnitude, options.depth5Sigma, gamma);
  return Math.sqrt(floor * floor + random * random);
}

/**
 * Per-point errors in magnitudes for an array of magnitudes (see {@link photometricError}).
 */
export function photometricErrors(magnitudes: ArrayLike<number>, options: PhotometricErrorOptions): Float64Array {
  const errors = new Float64Array(magnitudes.length);
  for (let i = 0; i < magnitudes.length; i++) errors[i] = photometricError(magnitudes[i], options);
  return errors;
}
