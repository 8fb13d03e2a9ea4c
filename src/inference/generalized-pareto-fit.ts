/**
 * The shape k and scale sigma of a generalised Pareto distribution fitted to positive exceedances x:
 * F(x) = 1 - (1 + k x / sigma)^(-1/k). Used to smooth the largest importance weights and to judge them:
 * the variance of the weights is finite only for k < 1/2, their mean only for k < 1.
 *
 * Estimator of Zhang & Stephens 2009 (Technometrics 51, 316), from memory: with theta = -k / sigma, the
 * shape that maximises the likelihood for a given theta is kappa(theta) = mean ln(1 - theta x), and the
 * profile log-likelihood is n [ln(-theta / kappa) - kappa - 1]. It is evaluated on a grid of
 * m = 30 + floor(sqrt(n)) points theta_j = 1 / x_(n) + (1 - sqrt(m / (j - 1/2))) / (3 x_(q)) (x_(q) the
 * first quartile), theta-hat is the mean over the grid weighted by the profile likelihood, and
 * k = kappa(theta-hat), sigma = -k / theta-hat. Vehtari, Simpson, Gelman, Yao & Gabry 2024 (JMLR 25,
 * "Pareto smoothed importance sampling", from memory) shrink k towards 1/2 as if by 10 more
 * observations: k <- (n k + 10 / 2) / (n + 10).
 *
 * @param sortedExceedances positive values, ascending
 */
export function fitGeneralizedPareto(sortedExceedances: ArrayLike<number>): { readonly shape: number; readonly scale: number } {
  const x = sortedExceedances;
  const n = x.length;
  if (n < 5) throw new RangeError(`generalised Pareto fit: needs at least 5 exceedances, got ${n}`);
  const gridSize = 30 + Math.floor(Math.sqrt(n));
  const quartile = x[Math.max(0, Math.floor(n / 4 + 0.5) - 1)];
  const largest = x[n - 1];
  const theta = new Float64Array(gridSize);
  const profile = new Float64Array(gridSize);
  let best = -Infinity;
  for (let j = 0; j < gridSize; j++) {
    const t = 1 / largest + (1 - Math.sqrt(gridSize / (j + 0.5))) / (3 * quartile);
    theta[j] = t;
    const kappa = meanLogOneMinus(t, x);
    const value = n * (Math.log(-t / kappa) - kappa - 1);
    profile[j] = Number.isFinite(value) ? value : -Infinity;
    if (profile[j] > best) best = profile[j];
  }
  let weightSum = 0;
  let thetaHat = 0;
  for (let j = 0; j < gridSize; j++) {
    const w = Math.exp(profile[j] - best);
    weightSum += w;
    thetaHat += w * theta[j];
  }
  thetaHat /= weightSum;
  const raw = meanLogOneMinus(thetaHat, x);
  const scale = -raw / thetaHat;
  const prior = 10;
  const shape = (n * raw + prior * 0.5) / (n + prior);
  return { shape, scale };
}

/**
 * Quantile of the generalised Pareto distribution with shape k and scale sigma, q(p) = sigma ((1 - p)^(-k) - 1) / k
 * (sigma (-ln(1 - p)) in the limit k = 0).
 */
export function generalizedParetoQuantile(p: number, shape: number, scale: number): number {
  if (Math.abs(shape) < 1e-12) return -scale * Math.log1p(-p);
  return (scale * Math.expm1(-shape * Math.log1p(-p))) / shape;
}

/** mean over i of ln(1 - theta x_i). */
function meanLogOneMinus(theta: number, x: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += Math.log1p(-theta * x[i]);
  return sum / x.length;
}
