/**
 * ln Gamma(x) for x > 0 by the Lanczos approximation (Lanczos 1964, SIAM J. Numer. Anal. B1, 86) with
 * g = 7 and the nine coefficients of P. Godfrey (from memory; the tests check it against exact values
 * of Gamma at integers and half-integers). Relative accuracy about 1e-15.
 */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma needs x > 0, got ${x}`);
  if (x < 0.5) {
    // Reflection, Gamma(x) Gamma(1 - x) = pi / sin(pi x), keeps the series in its accurate range.
    return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  }
  const z = x - 1;
  let a = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];
