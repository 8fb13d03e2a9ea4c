/**
 * One data point of the fixed-interval smoother's backward pass (Durbin & Koopman 2012, Time Series
 * Analysis by State Space Methods, 2nd ed., section 4.4), in the explained-covariance form of the
 * semiseparable recursion, in place:
 *
 *     r <- r + p (z - u^T r) / D,   N <- N - (p (N u)^T + (N u) p^T) / D + p p^T (u^T N u / D^2 + 1 / D),
 *
 * with u = gains[offset ... offset + R), z the innovation and D the pivot (`inversePivot` = 1 / D);
 * `nu` is scratch of length R. Shared by the smoother over data and requested times and by the kept states.
 */
export function smootherBackwardStep(
  rVec: Float64Array,
  nMat: Float64Array,
  nu: Float64Array,
  p: Float64Array,
  gains: Float64Array,
  offset: number,
  innovation: number,
  inversePivot: number,
  r: number,
): void {
  let ur = 0;
  for (let i = 0; i < r; i++) ur += gains[offset + i] * rVec[i];
  for (let i = 0; i < r; i++) rVec[i] += p[i] * (innovation - ur) * inversePivot;
  let uNu = 0;
  for (let i = 0; i < r; i++) {
    let acc = 0;
    for (let j = 0; j < r; j++) acc += nMat[i * r + j] * gains[offset + j];
    nu[i] = acc;
    uNu += gains[offset + i] * acc;
  }
  const scale = uNu * inversePivot * inversePivot + inversePivot;
  for (let i = 0; i < r; i++)
    for (let j = 0; j < r; j++) nMat[i * r + j] += -(p[i] * nu[j] + nu[i] * p[j]) * inversePivot + p[i] * p[j] * scale;
}
