import { FactorizationError } from "./factorization-error.js";
import { backwardGeneralLoop, type BackwardScratch } from "./gradient-general-loop.js";
import { GradientTapeLayout } from "./gradient-tape.js";
import { reverseRecursion, type UnrolledReverse } from "./reverse-recursion.js";
import type { SemiseparableForm } from "./semiseparable-form.js";
import { generalLoop } from "./semiseparable-likelihood.js";
import { finishBlockAdjoint } from "./transition-adjoints.js";
import { TransitionLayout } from "./transition-layout.js";
import { RECURSION_CHUNK, runUnrolled, unrolledRecursion, type RecursionTotals } from "./unrolled-recursion.js";
import { HALF_LOG_TWO_PI } from "../numerics/gaussian-constants.js";

/** The log-likelihood and its gradient with respect to the kernel parameters, the noise and the data. */
export interface LikelihoodGradient {
  readonly value: number;
  /** d log L / d theta_k for each kernel parameter of the form. */
  readonly kernel: Float64Array;
  /** d log L / d noiseVariance_n for each point (chain to errors or jitter); empty with `pointwise: false`. */
  readonly noiseVariance: Float64Array;
  /** d log L / d residual_n for each point (the mean's gradient is minus their sum); empty with `pointwise: false`. */
  readonly residual: Float64Array;
  /** sum_n d log L / d noiseVariance_n (a jitter's gradient is 2 jitter times this). */
  readonly noiseVarianceSum: number;
  /** sum_n d log L / d residual_n (a constant mean's gradient is minus this). */
  readonly residualSum: number;
}

/** Options of {@link semiseparableLogLikelihoodGradient}. */
export interface GradientOptions {
  /** A constant subtracted from every value of `residual` on the fly (default 0). */
  readonly mean?: number;
  /** false: run the general loops even where written-out passes exist (for tests; bit-identical results). */
  readonly unrolled?: boolean;
  /** false: return only the sums over points of the noise and residual adjoints, not the N-sized arrays. */
  readonly pointwise?: boolean;
  /**
   * Where to keep the tape between calls (for a caller that evaluates many gradients on the same times, as a
   * sampler does): grown when too short, then reused, which spares an N R^2-sized allocation per call.
   */
  readonly workspace?: GradientWorkspace;
}

/** Reusable memory for the gradient's tape (see `GradientOptions.workspace`). */
export interface GradientWorkspace {
  tape?: Float64Array;
}

/**
 * The log-likelihood of `semiseparableLogLikelihood` and its exact gradient, by reverse-mode
 * differentiation through the recursion (Foreman-Mackey 2018, RNAAS 2, 31), in three stages:
 *
 * 1. forward pass: the likelihood's recursion, recording per point what the backward pass needs
 *    (gradient-tape.ts: A_k, g_k, each block's transition, u_k, 1 / D_k, z_k);
 * 2. backward pass: from the last point to the first, the adjoints of S_k and f_k carried back through
 *    the recursion (the formulas at backwardGeneralLoop), with each block's Phi-bar contracted into a few
 *    running sums per block (transition-adjoints.ts) rather than with dPhi / d theta_k for every parameter;
 * 3. assembly: the running sums mapped to the kernel's parameters, plus the terms of q and p:
 *    q-bar = sum_n u-bar_n + (sum_n D-bar_n) p.
 *
 * For blocks of size 1 and 2 (every kernel but products) both passes are written out per layout, with every
 * element of the state and its adjoint in a local (unrolled-recursion.ts, reverse-recursion.ts); they give
 * the same result as the general loops bit for bit (test/linalg/semiseparable-gradient.test.ts). Both passes
 * cost O(N R^2); memory is the tape, O(N R^2).
 */
export function semiseparableLogLikelihoodGradient(
  form: SemiseparableForm,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  options: GradientOptions = {},
): LikelihoodGradient {
  const n = time.length;
  const layout = GradientTapeLayout.of(form);
  const tape = tapeFor(options.workspace, Math.max(1, n) * layout.width);
  const written = options.unrolled === false || layout.observationVaries ? undefined : writtenPasses(form);
  const totals = forwardPass(form, layout, tape, time, noiseVariance, residual, options.mean ?? 0, written?.forward);
  const value = -0.5 * (totals.quadratic + totals.logDeterminant) - n * HALF_LOG_TWO_PI;
  if (!(value > -Infinity && value < Infinity)) throw new FactorizationError(n - 1, NaN);

  const pointwise = options.pointwise !== false;
  const noiseBar = pointwise ? new Float64Array(n) : undefined;
  const residualBar = pointwise ? new Float64Array(n) : undefined;
  const kernelBar = new Float64Array(form.parameterCount);
  const adjoint = new Float64Array(layout.adjointLength);
  backwardPass(form, layout, tape, time, adjoint, kernelBar, residualBar, noiseBar, written?.reverse);
  assembleKernelGradient(form, layout, adjoint, kernelBar);
  return {
    value,
    kernel: kernelBar,
    noiseVariance: noiseBar ?? new Float64Array(0),
    residual: residualBar ?? new Float64Array(0),
    noiseVarianceSum: adjoint[layout.noiseBarSum],
    residualSum: adjoint[layout.residualBarSum],
  };
}

/** A tape of at least `length` values: the workspace's when it is long enough (grown otherwise), else a new one. */
function tapeFor(workspace: GradientWorkspace | undefined, length: number): Float64Array {
  if (!workspace) return new Float64Array(length);
  if (!workspace.tape || workspace.tape.length < length) workspace.tape = new Float64Array(length);
  return workspace.tape;
}

/** The written-out forward (recording) and backward passes for this layout, if it has them. */
function writtenPasses(form: SemiseparableForm) {
  const forward = unrolledRecursion(form.blocks, { record: true });
  const reverse = forward && reverseRecursion(form.blocks);
  return forward && reverse ? { forward, reverse } : undefined;
}

/** Stage 1: the likelihood's recursion, writing the tape. */
function forwardPass(
  form: SemiseparableForm,
  layout: GradientTapeLayout,
  tape: Float64Array,
  time: ArrayLike<number>,
  noiseVariance: ArrayLike<number>,
  residual: ArrayLike<number>,
  mean: number,
  written: ReturnType<typeof unrolledRecursion>,
): RecursionTotals {
  if (written) return runUnrolled(written, form, time, noiseVariance, residual, mean, false, tape);
  return generalLoop(form, time, noiseVariance, residual, mean, { layout, tape, scratch: new Float64Array(2) });
}

/** Stage 2: the adjoints carried from the last point to the first, chunk by chunk. */
function backwardPass(
  form: SemiseparableForm,
  layout: GradientTapeLayout,
  tape: Float64Array,
  time: ArrayLike<number>,
  adjoint: Float64Array,
  kernelBar: Float64Array,
  residualBar: Float64Array | undefined,
  noiseBar: Float64Array | undefined,
  written: UnrolledReverse | undefined,
): void {
  const n = time.length;
  const scratch = written ? undefined : backwardScratch(form);
  for (let end = n; end > 0; end -= RECURSION_CHUNK) {
    const begin = Math.max(0, end - RECURSION_CHUNK);
    if (written) written(form.blocks, form.observation, adjoint, kernelBar, tape, time, residualBar, noiseBar, begin, end);
    else backwardGeneralLoop(form, layout, tape, time, adjoint, kernelBar, scratch!, residualBar, noiseBar, begin, end);
  }
}

function backwardScratch(form: SemiseparableForm): BackwardScratch {
  const transitions = new TransitionLayout(form);
  const r = transitions.dimension;
  let derivativeLength = 1;
  for (const block of form.blocks) derivativeLength = Math.max(derivativeLength, block.parameterIndex.length * block.size * block.size);
  const largest = form.blocks.reduce((size, block) => Math.max(size, block.size), 1);
  return {
    product: new Float64Array(r * r),
    phi: transitions.phi,
    phiBar: new Float64Array(largest * largest),
    vector: new Float64Array(r),
    packed: new Float64Array((r * (r + 1)) / 2),
    derivatives: new Float64Array(derivativeLength),
    transitions,
  };
}

/**
 * Stage 3: the blocks' running sums mapped to the kernel parameters, then the terms of q and p:
 * d log L / d theta_k += q-bar . dq/dtheta_k + p-bar . dp/dtheta_k.
 */
function assembleKernelGradient(form: SemiseparableForm, layout: GradientTapeLayout, adjoint: Float64Array, kernelBar: Float64Array): void {
  const r = layout.dimension;
  form.blocks.forEach((block, b) => finishBlockAdjoint(layout.kinds[b], block, adjoint, layout.blockAccumulators[b], kernelBar));
  const noiseSum = adjoint[layout.noiseBarSum];
  for (let c = 0; c < form.parameterCount; c++) {
    let sum = kernelBar[c];
    for (let i = 0; i < r; i++) {
      const qBar = adjoint[layout.gainBarSum + i] + noiseSum * form.observation[i];
      sum += qBar * form.projectionGradient[c * r + i];
      if (layout.observationVaries) sum += adjoint[layout.observationBar + i] * form.observationGradient[c * r + i];
    }
    kernelBar[c] = sum;
  }
}
