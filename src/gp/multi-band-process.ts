import type { Kernel } from "../kernels/kernel.js";
import type { SemiseparableForm } from "../linalg/semiseparable-form.js";
import { bandScaledLogLikelihood } from "../linalg/band-scaled-likelihood.js";
import { semiseparableLogLikelihoodGradient } from "../linalg/semiseparable-gradient.js";
import { semiseparablePredict } from "../linalg/semiseparable-smoother.js";
import type { BandScaling } from "../linalg/unrolled-recursion.js";
import { bandColumns, emptyMerge, expectedMoves, mergeBands, reshiftMerge, type BandColumns, type BandMerge } from "./band-merge.js";
import { bandMeanSums, integrateBandMeans, type BandMeanMarginal, type BandMeanPrior } from "./band-mean-sums.js";

/** The observations of one band. */
export interface BandObservations {
  /** The band's name (for example "g"), used in messages and results. */
  readonly name: string;
  /** Sorted observation times, input time unit. */
  readonly time: ArrayLike<number>;
  /** The values (magnitudes or fluxes), one per time. */
  readonly values: ArrayLike<number>;
  /** Per-point 1-sigma errors (array or one number for all); default 0. */
  readonly errors?: number | ArrayLike<number>;
}

/** Per-band parameters of a process seen in several bands (one entry per band, in band order). */
export interface BandParameters {
  /** a_b: the band's response to the shared process (non-zero; 1 for a reference band). */
  readonly amplitude: ArrayLike<number>;
  /** m_b: the band's constant mean, unit of its values. */
  readonly mean: ArrayLike<number>;
  /** j_b >= 0: extra white noise added in quadrature to the band's errors (default 0). */
  readonly jitter?: ArrayLike<number>;
  /** l_b: the band sees the shared process at t - l_b, input time unit (default 0). */
  readonly lag?: ArrayLike<number>;
}

/** The joint log-likelihood and its gradient. */
export interface MultiBandGradient {
  readonly value: number;
  /** d log L / d kernel parameter, in the kernel's `parameterNames` order. */
  readonly kernel: Float64Array;
  /** d log L / d a_b, d m_b, d j_b and d l_b, one entry per band. */
  readonly amplitude: Float64Array;
  readonly mean: Float64Array;
  readonly jitter: Float64Array;
  /** By Richardson-extrapolated central differences of the exact likelihood (see {@link MultiBandProcess.logLikelihoodGradient}); zeros with `lags: false`. */
  readonly lag: Float64Array;
}

/** Posterior mean and variance of a band's latent light curve m_b + a_b f(t - l_b). */
export interface BandPrediction {
  readonly mean: Float64Array;
  readonly variance: Float64Array;
}

/** The process conditioned on the values of every band. */
export interface ConditionedBands {
  /** The latent (noise-free) light curve of band `band` (index or name) at any times. */
  at(band: number | string, times: ArrayLike<number>): BandPrediction;
}

/** Validated times and errors of all bands, shared by every parameter vector. */
interface CheckedBands {
  readonly names: readonly string[];
  /** Times, errors^2 and values, band after band (flat numbering). */
  readonly columns: BandColumns;
  /** Each band's times (views into `columns.time`). */
  readonly times: readonly Float64Array[];
  readonly counts: Int32Array;
  /** Last minus first time over all bands (1 for a single epoch). */
  readonly baseline: number;
  /** The last joint order computed, for the lags it was computed for. */
  order?: JointOrder;
}

/**
 * A joint order with the data laid out in it (`merge`), the per-band constants the engine scales them with
 * (`scaling`), and scratch for the scaled residuals and noise variances of the passes that need them as
 * arrays (gradient, predictions). Every array is reused: a new lag vector repairs the order in place
 * (`reshiftMerge`), or merges the bands again into the same buffers when it moves them too far.
 */
interface JointOrder {
  /** The lags `merge` was computed for. */
  readonly lags: Float64Array;
  readonly merge: BandMerge;
  readonly residual: Float64Array;
  readonly noise: Float64Array;
  readonly scaling: BandScaling;
}

const isFiniteValue = (x: number): boolean => x - x === 0;

/**
 * A changed lag vector repairs the last joint order by insertion while that is expected to need at most
 * this many moves per point (`expectedMoves`); beyond, a new B-way merge (O(N B)) is cheaper. Measured
 * (bench/README.md, "Re-merging the bands"): a merge costs about 30-40 ns per point, a repair about 6 ns per
 * point plus about 30 per move, and on seasonal cadences the estimate is about 0.7 of the moves made.
 */
const REPAIR_MOVES_PER_POINT = 0.5;

/** A repair whose estimate was too low gives up after this many times the moves it was expected to need at most. */
const REPAIR_MOVES_CAP = 2;

/**
 * One latent Gaussian process f seen in several bands: band b observes m_b + a_b f(t - l_b) + noise, so
 * the covariance of two points is a_b(i) a_b(j) k(t_i - l_b(i) - t_j + l_b(j)) + delta_ij (e_i^2 + j_b(i)^2)
 * (the multi-band semiseparable model of Gordon et al. 2020, AJ 160, 240, with lags).
 *
 * No new engine is needed. With the points in joint order of their shifted times and D = diag(a_b(i)),
 * a_i a_j k + N = D (K0 + D^-1 N D^-1) D, so
 *
 *     log L(y) = log L0((y - m) / a ; noise / a^2) - sum_i log |a_b(i)|,
 *
 * where L0 is the single-process likelihood of the semiseparable engine at the shifted times: O(N R^2) for
 * N points over all bands, plus an O(N B) merge of the B bands' sorted times when the lags change.
 *
 * @example
 * const joint = new MultiBandProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }),
 *   [{ name: "g", time: tg, values: yg, errors: eg }, { name: "r", time: tr, values: yr, errors: er }],
 *   { amplitude: [1, 0.8], mean: [19.2, 18.9], lag: [0, 3] });
 * joint.logLikelihood(); joint.given().at("r", grid);
 */
export class MultiBandProcess {
  readonly kernel: Kernel;
  private readonly form: SemiseparableForm;
  private readonly bands: CheckedBands;
  private readonly amplitude: Float64Array;
  private readonly mean: Float64Array;
  private readonly jitter: Float64Array;
  private readonly lag: Float64Array;

  /**
   * @param kernel the shared process's kernel (any kernel with a semiseparable form)
   * @param bands each band's sorted times, values and errors
   * @param parameters per-band amplitude, mean, jitter and lag
   * @internal the last parameter (checked bands of another process, see {@link withParameters})
   */
  constructor(kernel: Kernel, bands: readonly BandObservations[], parameters: BandParameters, checked?: CheckedBands) {
    const form = kernel.semiseparableForm();
    if (!form) throw new RangeError("MultiBandProcess: this kernel has no semiseparable form");
    this.kernel = kernel;
    this.form = form;
    this.bands = checked ?? checkBands(bands);
    const count = this.bands.names.length;
    this.amplitude = bandVector("amplitude", parameters.amplitude, count, (a) => a !== 0);
    this.mean = bandVector("mean", parameters.mean, count, () => true);
    this.jitter = bandVector("jitter", parameters.jitter ?? new Float64Array(count), count, (j) => j >= 0);
    this.lag = bandVector("lag", parameters.lag ?? new Float64Array(count), count, () => true);
  }

  /** The same bands (times, values and errors not checked again) with another kernel and band parameters. */
  withParameters(kernel: Kernel, parameters: BandParameters): MultiBandProcess {
    return new MultiBandProcess(kernel, [], parameters, this.bands);
  }

  /** The band names, in band order. */
  get bandNames(): readonly string[] {
    return this.bands.names;
  }

  /**
   * The log-likelihood of every band's values. O(N R^2): one pass of the engine, which scales the
   * residuals and noise variances per band inside its loop (`bandScaledLogLikelihood`); with lags that
   * moved since the last call, one light pass that shifts the times and repairs their order
   * (`reshiftMerge`).
   */
  logLikelihood(): number {
    const order = this.joint(this.lag);
    const scaling = this.scalingIn(order, this.mean);
    return bandScaledLogLikelihood(this.form, order.merge.time, order.merge.errorVariance, order.merge.values, scaling) - this.logAmplitudeSum();
  }

  /** The order's per-band constants for this process: 1 / a_b, the given shift (the means), j_b^2. */
  private scalingIn(order: JointOrder, shift: ArrayLike<number>): BandScaling {
    const scaling = order.scaling;
    for (let b = 0; b < this.amplitude.length; b++) {
      scaling.inverse[b] = 1 / this.amplitude[b];
      scaling.shift[b] = shift[b];
      scaling.extra[b] = this.jitter[b] * this.jitter[b];
    }
    return scaling;
  }

  /**
   * The log-likelihood and its gradient. Kernel parameters, amplitudes, means and jitters are exact, by
   * the chain rule through the engine's reverse-mode gradient with respect to the scaled residuals
   * r_i = (y_i - m_b) / a_b and scaled noise variances n_i = (e_i^2 + j_b^2) / a_b^2:
   *
   *     d/d m_b = -sum_b rbar_i / a_b,  d/d a_b = -sum_b (rbar_i r_i + 2 nbar_i n_i) / a_b - N_b / a_b,
   *     d/d j_b = sum_b 2 nbar_i j_b / a_b^2.
   *
   * The lags move the times of the recursion, with respect to which the engine has no adjoint; their
   * derivatives are Richardson-extrapolated central differences of the exact likelihood (4 B likelihood
   * evaluations). Where two shifted times coincide a kernel with a kink at zero lag (the
   * damped random walk) makes the likelihood continuous but not differentiable. With `lags: false` (lags
   * held fixed) the lag derivatives are not computed and returned as zeros.
   */
  logLikelihoodGradient(options: { readonly lags?: boolean } = {}): MultiBandGradient {
    const { merge, residual, noise } = this.scaled();
    const g = semiseparableLogLikelihoodGradient(this.form, merge.time, noise, residual);
    const count = this.bands.names.length;
    const amplitude = new Float64Array(count);
    const mean = new Float64Array(count);
    const jitter = new Float64Array(count);
    for (let k = 0; k < merge.band.length; k++) {
      const b = merge.band[k];
      const rBar = g.residual[k];
      const nBar = g.noiseVariance[k];
      mean[b] -= rBar;
      amplitude[b] -= rBar * residual[k] + 2 * nBar * noise[k];
      jitter[b] += nBar;
    }
    for (let b = 0; b < count; b++) {
      const a = this.amplitude[b];
      mean[b] /= a;
      amplitude[b] = (amplitude[b] - this.bands.counts[b]) / a;
      jitter[b] *= (2 * this.jitter[b]) / (a * a);
    }
    return {
      value: g.value - this.logAmplitudeSum(),
      kernel: g.kernel,
      amplitude,
      mean,
      jitter,
      lag: options.lags === false ? new Float64Array(count) : this.lagGradient(),
    };
  }

  /**
   * The likelihood with every band's mean integrated out under independent normal priors, and the
   * means' Gaussian posterior given the other parameters ({@link integrateBandMeans}); the process's own
   * `mean` parameters play no part. One O(N (R^2 + B R + B^2)) pass.
   */
  meanMarginal(priors: readonly BandMeanPrior[]): BandMeanMarginal {
    const count = this.bands.names.length;
    if (priors.length !== count) throw new RangeError(`MultiBandProcess: ${priors.length} mean priors for ${count} bands`);
    const order = this.joint(this.lag);
    const scaling = this.scalingIn(order, Float64Array.from(priors, (prior) => prior.mean));
    const sums = bandMeanSums(this.form, order.merge.time, order.merge.errorVariance, order.merge.values, scaling);
    return integrateBandMeans(sums, priors, 2 * this.logAmplitudeSum(), order.merge.time.length);
  }

  /** The process conditioned on every band's values; `at(band, times)` predicts a band's latent light curve. */
  given(): ConditionedBands {
    const { merge, residual, noise } = this.scaled();
    const time = Float64Array.from(merge.time);
    const r = Float64Array.from(residual);
    const n = Float64Array.from(noise);
    return {
      at: (band, times) => {
        const b = this.bandIndex(band);
        const a = this.amplitude[b];
        const order = Int32Array.from({ length: times.length }, (_, i) => i);
        for (let i = 0; i < times.length; i++)
          if (!isFiniteValue(times[i])) throw new RangeError(`MultiBandProcess: requested time[${i}] is not finite (${times[i]})`);
        order.sort((i, j) => times[i] - times[j]);
        const shifted = Float64Array.from(order, (i) => times[i] - this.lag[b]);
        const latent = semiseparablePredict(this.form, time, n, r, shifted);
        const mean = new Float64Array(times.length);
        const variance = new Float64Array(times.length);
        for (let k = 0; k < order.length; k++) {
          mean[order[k]] = this.mean[b] + a * latent.mean[k];
          variance[order[k]] = a * a * latent.variance[k];
        }
        return { mean, variance };
      },
    };
  }

  private bandIndex(band: number | string): number {
    const index = typeof band === "number" ? band : this.bands.names.indexOf(band);
    if (!(Number.isInteger(index) && index >= 0 && index < this.bands.names.length))
      throw new RangeError(`MultiBandProcess: no band ${JSON.stringify(band)} (bands: ${this.bands.names.join(", ")})`);
    return index;
  }

  private logAmplitudeSum(): number {
    let total = 0;
    for (let b = 0; b < this.amplitude.length; b++) total += this.bands.counts[b] * Math.log(Math.abs(this.amplitude[b]));
    return total;
  }

  /**
   * The joint order for these lags (cached: without lags it is computed once per set of bands; a lag
   * step repairs the last order, see `JointOrder`).
   */
  private joint(lag: Float64Array): JointOrder {
    const cached = this.bands.order;
    if (cached && sameValues(cached.lags, lag)) return cached;
    const { columns, baseline } = this.bands;
    const total = columns.time.length;
    const limit = REPAIR_MOVES_PER_POINT * total;
    const repaired =
      cached !== undefined &&
      expectedMoves(columns.offsets, cached.lags, lag, baseline) <= limit &&
      reshiftMerge(cached.merge, lag, REPAIR_MOVES_CAP * limit);
    const order = cached ?? newOrder(total, lag.length);
    if (!repaired) mergeBands(columns, lag, order.merge);
    order.lags.set(lag);
    this.bands.order = order;
    return order;
  }

  /**
   * Scaled residuals (y - m_b) / a_b and noise variances (e^2 + j_b^2) / a_b^2 in joint order, in the
   * order's scratch arrays (valid until the next call on a process of the same bands).
   */
  private scaled(): { merge: BandMerge; residual: Float64Array; noise: Float64Array } {
    const order = this.joint(this.lag);
    const { inverse, shift, extra } = this.scalingIn(order, this.mean);
    const { merge, residual, noise } = order;
    const { band, errorVariance, values } = merge;
    for (let k = 0; k < residual.length; k++) {
      const b = band[k];
      const w = inverse[b];
      residual[k] = (values[k] - shift[b]) * w;
      noise[k] = (errorVariance[k] + extra[b]) * w * w;
    }
    return { merge, residual, noise };
  }

  /**
   * d log L / d l_b by Richardson-extrapolated central differences: D(h) = (L(l + h) - L(l - h)) / 2h has
   * error c2 h^2 + c4 h^4, so (4 D(h/2) - D(h)) / 3 leaves O(h^4); h = 1e-6 of the baseline (a kink of the kernel within h of a crossing spoils it).
   */
  private lagGradient(): Float64Array {
    const count = this.lag.length;
    const out = new Float64Array(count);
    if (count < 2) return out;
    const step = 1e-6 * this.bands.baseline;
    const shifted = Float64Array.from(this.lag);
    const at = (b: number, offset: number): number => {
      shifted[b] = this.lag[b] + offset;
      const order = this.joint(shifted);
      shifted[b] = this.lag[b];
      const { time, errorVariance, values } = order.merge;
      return bandScaledLogLikelihood(this.form, time, errorVariance, values, this.scalingIn(order, this.mean));
    };
    for (let b = 0; b < count; b++) {
      const wide = (at(b, step) - at(b, -step)) / (2 * step);
      const narrow = (at(b, step / 2) - at(b, -step / 2)) / step;
      out[b] = (4 * narrow - wide) / 3;
    }
    return out;
  }
}

/** Buffers for a joint order of `total` points in `count` bands. */
function newOrder(total: number, count: number): JointOrder {
  const merge = emptyMerge(total);
  return {
    lags: new Float64Array(count),
    merge,
    residual: new Float64Array(total),
    noise: new Float64Array(total),
    scaling: { band: merge.band, inverse: new Float64Array(count), shift: new Float64Array(count), extra: new Float64Array(count) },
  };
}

function sameValues(a: Float64Array, b: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** Copies a per-band parameter vector, checking its length and values. */
function bandVector(name: string, values: ArrayLike<number>, count: number, admissible: (x: number) => boolean): Float64Array {
  if (values.length !== count) throw new RangeError(`MultiBandProcess: ${name} has ${values.length} values for ${count} bands`);
  const out = Float64Array.from(values);
  for (let b = 0; b < count; b++)
    if (!(isFiniteValue(out[b]) && admissible(out[b]))) throw new RangeError(`MultiBandProcess: ${name}[${b}] = ${out[b]} is not admissible`);
  return out;
}

/** Checks every band's times (finite, sorted), values (finite) and errors (finite, >= 0), laid out band after band. */
function checkBands(bands: readonly BandObservations[]): CheckedBands {
  if (bands.length < 1) throw new RangeError("MultiBandProcess: at least one band is required");
  const names = bands.map((b) => b.name);
  if (new Set(names).size !== names.length) throw new RangeError(`MultiBandProcess: band names repeat (${names.join(", ")})`);
  const counts = Int32Array.from(bands, (b) => b.time.length);
  const offsets = new Int32Array(bands.length);
  let total = 0;
  for (let b = 0; b < bands.length; b++) {
    offsets[b] = total;
    total += counts[b];
  }
  if (total < 1) throw new RangeError("MultiBandProcess: at least one time is required");
  const errorVariance = new Float64Array(total);
  const values = new Float64Array(total);
  const times = bands.map((band, b) => {
    const t = Float64Array.from(band.time);
    if (band.values.length !== t.length)
      throw new RangeError(`MultiBandProcess: band ${band.name} has ${band.values.length} values for ${t.length} times`);
    const errors = band.errors ?? 0;
    if (typeof errors !== "number" && errors.length !== t.length)
      throw new RangeError(`MultiBandProcess: band ${band.name} has ${errors.length} errors for ${t.length} times`);
    for (let i = 0; i < t.length; i++) {
      if (!isFiniteValue(t[i])) throw new RangeError(`MultiBandProcess: band ${band.name} time[${i}] is not finite (${t[i]})`);
      if (i > 0 && t[i] < t[i - 1]) throw new RangeError(`MultiBandProcess: band ${band.name} times must be sorted ascending (time[${i}] < time[${i - 1}])`);
      const e = typeof errors === "number" ? errors : errors[i];
      if (!(isFiniteValue(e) && e >= 0)) throw new RangeError(`MultiBandProcess: band ${band.name} errors[${i}] must be finite and >= 0, got ${e}`);
      errorVariance[offsets[b] + i] = e * e;
      const y = band.values[i];
      if (!isFiniteValue(y)) throw new RangeError(`MultiBandProcess: band ${band.name} value[${i}] is not finite (${y})`);
      values[offsets[b] + i] = y;
    }
    return t;
  });
  const columns = bandColumns(times, errorVariance, values);
  let first = Infinity;
  let last = -Infinity;
  for (const t of times) {
    if (t.length === 0) continue;
    first = Math.min(first, t[0]);
    last = Math.max(last, t[t.length - 1]);
  }
  const views = times.map((_, b) => columns.time.subarray(columns.offsets[b], columns.offsets[b + 1]));
  return { names, columns, times: views, counts, baseline: last > first ? last - first : 1 };
}
