/** Options of a Gaussian process conditioned on observation times. */
export interface GaussianProcessOptions {
  /** Per-point 1-sigma measurement errors (array, same length as the times) or one error for all. Default 0. */
  readonly yerr?: number | ArrayLike<number>;
  /** Constant mean of the process, in the unit of the data. Default 0. */
  readonly mean?: number;
  /** Extra white-noise standard deviation added in quadrature to every error ("jitter"). Default 0. */
  readonly jitter?: number;
}

/** Posterior prediction of the latent (noise-free) process. */
export interface Prediction {
  readonly mean: Float64Array;
  readonly variance: Float64Array;
  /** Full M x M posterior covariance (row-major), when requested. */
  readonly covariance?: Float64Array;
}

/** The log-likelihood and its gradient. */
export interface GradientResult {
  readonly value: number;
  /** d log L / d kernel parameter, in the kernel's `parameterNames` order. */
  readonly kernel: Float64Array;
  /** d log L / d mean. */
  readonly mean: number;
  /** d log L / d jitter. */
  readonly jitter: number;
}

/** Validated inputs shared by both engines. */
export interface ConditionedInputs {
  readonly time: Float64Array;
  readonly yerr: Float64Array;
  readonly mean: number;
  readonly jitter: number;
  readonly noiseVariance: Float64Array;
}

/** Checks times (finite, ascending), errors (finite, >= 0) and jitter; builds the noise variances. */
export function conditionInputs(time: ArrayLike<number>, options: GaussianProcessOptions): ConditionedInputs {
  const n = time.length;
  if (n < 1) throw new RangeError("GaussianProcess: at least one time is required");
  const t = copyToFloat64(time);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(t[i])) throw new RangeError(`GaussianProcess: time[${i}] is not finite (${t[i]})`);
    if (i > 0 && t[i] < t[i - 1])
      throw new RangeError(`GaussianProcess: times must be sorted ascending (time[${i}] = ${t[i]} < time[${i - 1}] = ${t[i - 1]})`);
  }
  const yerrInput = options.yerr ?? 0;
  const yerr = typeof yerrInput === "number" ? new Float64Array(n).fill(yerrInput) : copyToFloat64(yerrInput);
  if (yerr.length !== n) throw new RangeError(`GaussianProcess: yerr has ${yerr.length} values for ${n} times`);
  for (let i = 0; i < n; i++)
    if (!Number.isFinite(yerr[i]) || yerr[i] < 0)
      throw new RangeError(`GaussianProcess: yerr[${i}] must be finite and >= 0, got ${yerr[i]}`);
  const jitter = options.jitter ?? 0;
  if (!Number.isFinite(jitter) || jitter < 0) throw new RangeError(`GaussianProcess: jitter must be finite and >= 0, got ${jitter}`);
  const mean = options.mean ?? 0;
  if (!Number.isFinite(mean)) throw new RangeError(`GaussianProcess: mean must be finite, got ${mean}`);
  const noiseVariance = new Float64Array(n);
  for (let i = 0; i < n; i++) noiseVariance[i] = yerr[i] * yerr[i] + jitter * jitter;
  return { time: t, yerr, mean, jitter, noiseVariance };
}

/** Checks that y has one finite value per time and returns y - mean. */
export function residualOf(y: ArrayLike<number>, inputs: ConditionedInputs): Float64Array {
  if (y.length !== inputs.time.length)
    throw new RangeError(`GaussianProcess: y has ${y.length} values for ${inputs.time.length} times`);
  const out = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new RangeError(`GaussianProcess: y[${i}] is not finite (${y[i]})`);
    out[i] = y[i] - inputs.mean;
  }
  return out;
}

/** Sorts requested times, remembering where each came from. */
export function sortTargets(targets: ArrayLike<number>): { sorted: Float64Array; order: Int32Array } {
  const order = Int32Array.from({ length: targets.length }, (_, i) => i);
  for (let i = 0; i < targets.length; i++)
    if (!Number.isFinite(targets[i])) throw new RangeError(`predict: requested time[${i}] is not finite (${targets[i]})`);
  order.sort((a, b) => targets[a] - targets[b]);
  const sorted = Float64Array.from(order, (i) => targets[i]);
  return { sorted, order };
}

/** A Float64Array copy; typed arrays are copied in bulk rather than through the iterator protocol. */
function copyToFloat64(values: ArrayLike<number>): Float64Array {
  return values instanceof Float64Array ? values.slice() : Float64Array.from(values);
}
