/**
 * The central difference quotient of `f` at `theta` along coordinate `c`,
 * (f(theta + h e_c) - f(theta - h e_c)) / (2 h) with h = `relativeStep` |theta_c|: the symmetric
 * difference quotient, truncation error O(h^2) (common practice; any text on numerical differentiation).
 * The reference for the analytic derivatives of kernels and likelihoods.
 */
export function centralDifference(f: (theta: Float64Array) => number, theta: ArrayLike<number>, c: number, relativeStep: number): number {
  const h = relativeStep * Math.abs(theta[c]);
  const up = Float64Array.from(theta);
  const down = Float64Array.from(theta);
  up[c] += h;
  down[c] -= h;
  return (f(up) - f(down)) / (2 * h);
}
