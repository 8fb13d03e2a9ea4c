import { FactorizationError } from "../linalg/factorization-error.js";
import type { GradientWorkspace } from "../linalg/semiseparable-gradient.js";
import type { GaussianProcessOptions } from "./process-interface.js";

/** Validated inputs shared by both engines. */
export interface ConditionedInputs {
  readonly time: Float64Array;
  /** errors^2 per point. */
  readonly errorVariance: Float64Array;
  readonly mean: number;
  readonly jitter: number;
  /** errors^2 + jitter^2 per point (the same array as errorVariance when the jitter is 0). */
  readonly noiseVariance: Float64Array;
  /**
   * Memory for the gradient's tape, shared by every process made from these times with `withKernel` (a
   * sampler's gradients reuse it instead of allocating O(N R^2) per call).
   */
  readonly gradientWorkspace: GradientWorkspace;
}

/** True for a finite number (comparisons only: cheaper in V8's loops than Number.isFinite on array elements). */
const isFiniteValue = (x: number): boolean => x - x === 0;

/**
 * Checks times (finite, ascending), errors (finite, >= 0), mean and jitter; copies the times and forms the
 * noise variances, in one pass over the points.
 */
export function conditionInputs(time: ArrayLike<number>, options: GaussianProcessOptions): ConditionedInputs {
  const n = time.length;
  if (n < 1) throw new RangeError("GaussianProcess: at least one time is required");
  const errors = options.errors ?? 0;
  if (typeof errors !== "number" && errors.length !== n)
    throw new RangeError(`GaussianProcess: errors has ${errors.length} values for ${n} times`);
  const t = new Float64Array(n);
  const errorVariance = new Float64Array(n);
  const bad = typeof errors === "number" ? copyChecked(time, t, new Float64Array(n).fill(errors), errorVariance) : copyChecked(time, t, errors, errorVariance);
  if (bad < n) {
    const e = typeof errors === "number" ? errors : errors[bad];
    if (!isFiniteValue(time[bad])) throw new RangeError(`GaussianProcess: time[${bad}] is not finite (${time[bad]})`);
    if (bad > 0 && time[bad] < time[bad - 1])
      throw new RangeError(
        `GaussianProcess: times must be sorted ascending (time[${bad}] = ${time[bad]} < time[${bad - 1}] = ${time[bad - 1]})`,
      );
    throw new RangeError(`GaussianProcess: errors[${bad}] must be finite and >= 0, got ${e}`);
  }
  return withMeanAndJitter({ time: t, errorVariance, mean: 0, jitter: 0, noiseVariance: errorVariance, gradientWorkspace: {} }, options);
}

/**
 * Copies the times into `t` and the squared errors into `errorVariance`; returns the index of the first
 * point whose time is not finite or out of order or whose error is not finite and >= 0, or n when all are
 * good. Kept apart from the messages so that V8 compiles the loop on its own.
 */
function copyChecked(time: ArrayLike<number>, t: Float64Array, errors: ArrayLike<number>, errorVariance: Float64Array): number {
  const n = t.length;
  let previous = -Infinity;
  for (let i = 0; i < n; i++) {
    const ti = time[i];
    const e = errors[i];
    if (!(ti - ti === 0 && ti >= previous && e - e === 0 && e >= 0)) return i;
    t[i] = ti;
    errorVariance[i] = e * e;
    previous = ti;
  }
  return n;
}

/**
 * The same validated times and errors with another mean and jitter (checked); the noise variances are
 * formed again only when the jitter changes.
 */
export function withMeanAndJitter(inputs: ConditionedInputs, options: Pick<GaussianProcessOptions, "mean" | "jitter">): ConditionedInputs {
  const jitter = options.jitter ?? 0;
  if (!(isFiniteValue(jitter) && jitter >= 0)) throw new RangeError(`GaussianProcess: jitter must be finite and >= 0, got ${jitter}`);
  const mean = options.mean ?? 0;
  if (!isFiniteValue(mean)) throw new RangeError(`GaussianProcess: mean must be finite, got ${mean}`);
  let noiseVariance = inputs.noiseVariance;
  if (jitter !== inputs.jitter) {
    const errorVariance = inputs.errorVariance;
    if (jitter === 0) noiseVariance = errorVariance;
    else {
      const j2 = jitter * jitter;
      noiseVariance = new Float64Array(errorVariance.length);
      for (let i = 0; i < noiseVariance.length; i++) noiseVariance[i] = errorVariance[i] + j2;
    }
  }
  return { time: inputs.time, errorVariance: inputs.errorVariance, mean, jitter, noiseVariance, gradientWorkspace: inputs.gradientWorkspace };
}

/**
 * Evaluates a one-pass function of y with the check of its values folded into that pass: the length is
 * checked first, and a value that is not finite makes the recursion's result non-finite, which it reports
 * as a FactorizationError; only then is y scanned ({@link checkValues}), so the error still names the bad
 * value. Saves the separate pass over y that checking first costs at every evaluation.
 */
export function evaluateWithDeferredValueCheck<T>(y: ArrayLike<number>, inputs: ConditionedInputs, evaluate: () => T): T {
  const n = inputs.time.length;
  if (y.length !== n) throw new RangeError(`GaussianProcess: ${y.length} values for ${n} times`);
  try {
    return evaluate();
  } catch (error) {
    if (error instanceof FactorizationError) checkValues(y, inputs);
    throw error;
  }
}

/** Checks that y has one finite value per time (without copying it). */
export function checkValues(y: ArrayLike<number>, inputs: ConditionedInputs): void {
  const n = inputs.time.length;
  if (y.length !== n) throw new RangeError(`GaussianProcess: ${y.length} values for ${n} times`);
  const bad = firstNonFinite(y);
  if (bad < n) throw new RangeError(`GaussianProcess: values[${bad}] is not finite (${y[bad]})`);
}

/** The index of the first value that is not finite, or the length. */
function firstNonFinite(y: ArrayLike<number>): number {
  for (let i = 0; i < y.length; i++) {
    const yi = y[i];
    if (!(yi - yi === 0)) return i;
  }
  return y.length;
}

/** Checks that y has one finite value per time and returns y - mean. */
export function residualOf(y: ArrayLike<number>, inputs: ConditionedInputs): Float64Array {
  checkValues(y, inputs);
  const out = new Float64Array(y.length);
  for (let i = 0; i < out.length; i++) out[i] = y[i] - inputs.mean;
  return out;
}
