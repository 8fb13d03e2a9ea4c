import { fftInPlace, nextPowerOfTwo } from "./fft.js";

/**
 * Sample autocovariance of a series about its own mean, with divisor n:
 * c_t = (1/n) sum_{i=0}^{n-1-t} (x_i - xbar)(x_{i+t} - xbar), for t = 0..n-1, computed by FFT with
 * zero padding to at least 2n so that the circular correlation equals the linear one
 * (Press et al., Numerical Recipes, 3rd ed., sec. 13.2).
 */
export function autocovariance(series: ArrayLike<number>): Float64Array {
  return autocovariances([series])[0];
}

/**
 * Autocovariances ({@link autocovariance}) of several series at once. Two real series share one
 * complex FFT (x in the real part, y in the imaginary part; X_k = (Z_k + conj Z_{m-k}) / 2 and
 * Y_k = (Z_k - conj Z_{m-k}) / 2i, Press et al., Numerical Recipes, 3rd ed., sec. 12.3), which halves
 * the cost of the convergence checks.
 */
export function autocovariances(series: readonly ArrayLike<number>[]): Float64Array[] {
  const out: Float64Array[] = [];
  for (let s = 0; s < series.length; s += 2) {
    const x = series[s];
    const y = s + 1 < series.length ? series[s + 1] : null;
    const n = x.length;
    if (y !== null && y.length !== n) throw new RangeError("autocovariance: series must have equal length");
    const cx = new Float64Array(n);
    const cy = new Float64Array(n);
    if (n > 0) {
      const m = nextPowerOfTwo(2 * n);
      const re = new Float64Array(m);
      const im = new Float64Array(m);
      let meanX = 0;
      let meanY = 0;
      for (let i = 0; i < n; i++) {
        meanX += x[i];
        if (y !== null) meanY += y[i];
      }
      meanX /= n;
      meanY /= n;
      for (let i = 0; i < n; i++) {
        re[i] = x[i] - meanX;
        if (y !== null) im[i] = y[i] - meanY;
      }
      fftInPlace(re, im);
      // Power spectra of both series: |X_k|^2 into pr, |Y_k|^2 into pi (both real and even in k).
      const pr = new Float64Array(m);
      const pi = new Float64Array(m);
      for (let k = 0; k < m; k++) {
        const j = (m - k) & (m - 1);
        const xr = 0.5 * (re[k] + re[j]);
        const xi = 0.5 * (im[k] - im[j]);
        const yr = 0.5 * (im[k] + im[j]);
        const yi = -0.5 * (re[k] - re[j]);
        pr[k] = xr * xr + xi * xi;
        pi[k] = yr * yr + yi * yi;
      }
      // The inverse transform of pr + i pi has the two (real) autocorrelations as its parts.
      fftInPlace(pr, pi, true);
      for (let t = 0; t < n; t++) {
        cx[t] = pr[t] / (m * n);
        cy[t] = pi[t] / (m * n);
      }
    }
    out.push(cx);
    if (y !== null) out.push(cy);
  }
  return out;
}

/**
 * Autocorrelation function of several chains of equal length, averaged over chains:
 * rho_t = (sum_m c_{m,t}) / (sum_m c_{m,0}), with c the per-chain autocovariance. Averaging the
 * chains' autocovariances before normalising weights every chain equally and is far less noisy than
 * the autocorrelation of one short chain.
 */
export function averagedAutocorrelation(chains: readonly ArrayLike<number>[]): Float64Array {
  if (chains.length === 0) return new Float64Array(0);
  const n = chains[0].length;
  const sum = new Float64Array(n);
  for (const c of autocovariances(chains)) {
    if (c.length !== n) throw new RangeError("autocorrelation: chains must have equal length");
    for (let t = 0; t < n; t++) sum[t] = sum[t] + c[t];
  }
  const c0 = sum[0];
  const rho = new Float64Array(n);
  if (!(c0 > 0)) {
    rho.fill(NaN);
    return rho;
  }
  for (let t = 0; t < n; t++) rho[t] = sum[t] / c0;
  return rho;
}

/** An integrated autocorrelation time with the window it was summed over. */
export interface AutocorrelationTime {
  /** tau = 1 + 2 sum_{t=1}^{M} rho_t, in steps. */
  readonly tau: number;
  /** The window M. */
  readonly window: number;
  /**
   * Whether Sokal's condition M >= c tau was met inside the series. When false the series is too
   * short for tau to be trusted (tau is then the sum over the whole series, a lower bound in practice).
   */
  readonly reliable: boolean;
}

/**
 * Integrated autocorrelation time with Sokal's adaptive window: tau(M) = 1 + 2 sum_{t=1}^{M} rho_t,
 * with M the smallest lag such that M >= c tau(M) (Sokal 1997, "Monte Carlo methods in statistical
 * mechanics", in Functional Integration, Springer, sec. 3; Goodman & Weare 2010 use c = 5 for
 * ensembles). For an AR(1) process x_t = phi x_{t-1} + e_t, tau = (1 + phi) / (1 - phi).
 *
 * @param rho autocorrelation function with rho_0 = 1
 */
export function integratedAutocorrelationTime(rho: ArrayLike<number>, c = 5): AutocorrelationTime {
  const n = rho.length;
  if (n === 0 || !Number.isFinite(rho[0])) return { tau: NaN, window: 0, reliable: false };
  let tau = 1;
  for (let m = 1; m < n; m++) {
    tau += 2 * rho[m];
    if (m >= c * tau) return { tau, window: m, reliable: true };
  }
  return { tau, window: n - 1, reliable: false };
}

/** Integrated autocorrelation time of several equal-length chains from their averaged autocorrelation. */
export function chainsAutocorrelationTime(chains: readonly ArrayLike<number>[], c = 5): AutocorrelationTime {
  return integratedAutocorrelationTime(averagedAutocorrelation(chains), c);
}
