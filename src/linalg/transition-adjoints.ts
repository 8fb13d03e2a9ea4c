import { decayFactor } from "./elementary-functions.js";
import { compileHelper } from "./emitted-helper.js";
import { ExponentialTransition } from "./exponential-transition.js";
import { dampedHyperbolicValues, oscillatorLambdaDerivative, OscillatorTransition } from "./oscillator-transition.js";
import type { TransitionBlock } from "./transition-block.js";

/**
 * What the gradient's two passes do with each block's transition Phi = exp(F dt), for the general loops
 * (gradient-general-loop.ts) and, as source text, for the written-out passes (unrolled-recursion.ts,
 * reverse-recursion.ts): the same operations in the same order, so both give bit-identical gradients.
 *
 * The forward pass records, per point and block, what the backward pass needs to rebuild Phi and its
 * derivatives ("tape"); the backward pass contracts the adjoint Phi-bar of each block with dPhi / d(native
 * parameter) and adds the result into a few running sums per block ("accumulators"), which are mapped to
 * the kernel's parameters once, after the pass ({@link finishBlockAdjoint}). Per point this costs a handful
 * of products per block, where contracting with dPhi / d theta_k for every kernel parameter k costs a full
 * derivative matrix per parameter.
 *
 * - exponential (Phi = exp(-rate dt)): tape [Phi]; one accumulator sum Phi-bar dt Phi, and
 *   d log L / d rate = -sum.
 * - oscillator (Phi = E (C I + S G), E = exp(-c dt), G = [[c, w0], [-w0, -c]], lambda = c^2 - w0^2; see
 *   oscillator-transition.ts): tape [E C, E S, E dS/dlambda]; E dC/dlambda = dt E S / 2. With
 *   P = Phi-bar, Pd = P01 - P10, Ps = P00 + P11, Pm = P00 - P11, six accumulators
 *   sum dt (P00 Phi00 + Pd Phi01 + P11 Phi11), sum Ps E dC/dlambda, sum Pm E dS/dlambda, sum Pd E dS/dlambda,
 *   sum Pm E S, sum Pd E S; then with T = a1 + c a2 + w0 a3, d log L / dc = -a0 + 2 c T + a4 and
 *   d log L / dw0 = -2 w0 T + a5 (c and w0 independent: d lambda / dc = 2c, d lambda / dw0 = -2 w0,
 *   dG / dc = diag(1, -1), dG / dw0 = [[0, 1], [-1, 0]]).
 * - any other block of size 1 or 2 ("generic"): tape Phi (m^2 values), and Phi-bar contracted with
 *   `transitionDerivatives` straight into the kernel's gradient.
 */
export type AdjointKind = "exponential" | "oscillator" | "generic";

export function adjointKind(block: TransitionBlock): AdjointKind {
  if (block instanceof ExponentialTransition) return "exponential";
  if (block instanceof OscillatorTransition) return "oscillator";
  return "generic";
}

/** Values per point that the forward pass records for a block. */
export function tapeWidth(kind: AdjointKind, size: number): number {
  return kind === "exponential" ? 1 : kind === "oscillator" ? 3 : size * size;
}

/** Running sums per block in the backward pass. */
export function accumulatorCount(kind: AdjointKind): number {
  return kind === "exponential" ? 1 : kind === "oscillator" ? 6 : 0;
}

/**
 * Writes one block's Phi = exp(F dt) into phi[phiOffset ...] and its tape into tape[tapeOffset ...] (general
 * loop). The same values as `block.transition`.
 */
export function recordTransition(
  kind: AdjointKind,
  block: TransitionBlock,
  dt: number,
  phi: Float64Array,
  phiOffset: number,
  tape: Float64Array,
  tapeOffset: number,
  scratch: Float64Array,
): void {
  if (kind === "exponential") {
    const value = decayFactor(-(block as ExponentialTransition).rate * dt);
    phi[phiOffset] = value;
    tape[tapeOffset] = value;
  } else if (kind === "oscillator") {
    const o = block as OscillatorTransition;
    const c = o.halfWidth;
    const w0 = o.w0;
    dampedHyperbolicValues(c, o.lambda, w0, dt, scratch);
    const ec = scratch[0];
    const es = scratch[1];
    phi[phiOffset] = ec + es * c;
    phi[phiOffset + 1] = es * w0;
    phi[phiOffset + 2] = -es * w0;
    phi[phiOffset + 3] = ec - es * c;
    tape[tapeOffset] = ec;
    tape[tapeOffset + 1] = es;
    tape[tapeOffset + 2] = oscillatorLambdaDerivative(c, o.lambda, dt, ec, es);
  } else {
    const m = block.size;
    block.transition(dt, phi, phiOffset);
    for (let e = 0; e < m * m; e++) tape[tapeOffset + e] = phi[phiOffset + e];
  }
}

/** Rebuilds one block's Phi from its tape (backward pass, general loop). */
export function transitionFromTape(kind: AdjointKind, block: TransitionBlock, tape: Float64Array, tapeOffset: number, phi: Float64Array, phiOffset: number): void {
  if (kind === "oscillator") {
    const o = block as OscillatorTransition;
    const ec = tape[tapeOffset];
    const es = tape[tapeOffset + 1];
    phi[phiOffset] = ec + es * o.halfWidth;
    phi[phiOffset + 1] = es * o.w0;
    phi[phiOffset + 2] = -es * o.w0;
    phi[phiOffset + 3] = ec - es * o.halfWidth;
  } else {
    const length = kind === "exponential" ? 1 : block.size * block.size;
    for (let e = 0; e < length; e++) phi[phiOffset + e] = tape[tapeOffset + e];
  }
}

/**
 * Adds one point's contribution of the block's Phi-bar (m x m at phiBar[0 ...]) to the block's accumulators
 * (exponential, oscillator) or, for a generic block, to the kernel gradient (general loop; see the file's
 * comment for the formulas). `phi` holds the block's Phi, `tape` its record of this step.
 */
export function accumulateBlockAdjoint(
  kind: AdjointKind,
  block: TransitionBlock,
  dt: number,
  phiBar: Float64Array,
  phi: Float64Array,
  phiOffset: number,
  tape: Float64Array,
  tapeOffset: number,
  accumulators: Float64Array,
  accumulatorOffset: number,
  kernelBar: Float64Array,
  scratch: Float64Array,
): void {
  if (kind === "exponential") {
    exponentialAdjoint(dt, phiBar, phi, phiOffset, accumulators, accumulatorOffset);
  } else if (kind === "oscillator") {
    oscillatorAdjoint(dt, phiBar, phi, phiOffset, tape, tapeOffset, accumulators, accumulatorOffset);
  } else {
    genericBlockAdjoint(block, dt, phiBar, kernelBar, scratch);
  }
}

/**
 * Phi-bar (m x m at phiBar[0 ...]) of a block without its own adjoint formulas, contracted with
 * `transitionDerivatives` and added to the kernel gradient. Called by the general loop and, for such blocks,
 * by the written-out backward pass, so both agree bit for bit.
 */
export function genericBlockAdjoint(block: TransitionBlock, dt: number, phiBar: Float64Array, kernelBar: Float64Array, scratch: Float64Array): void {
  const count = block.parameterIndex.length;
  if (count === 0) return;
  const mm = block.size * block.size;
  block.transitionDerivatives(dt, scratch, 0);
  for (let c = 0; c < count; c++) {
    let sum = phiBar[0] * scratch[c * mm];
    for (let e = 1; e < mm; e++) sum += phiBar[e] * scratch[c * mm + e];
    kernelBar[block.parameterIndex[c]] += sum;
  }
}

/**
 * Text of {@link accumulateBlockAdjoint} for exponential and oscillator blocks, on the given names (locals
 * in the written-out backward pass; array elements in the functions compiled from it below).
 */
export function accumulateBlockAdjointSource(
  kind: "exponential" | "oscillator",
  phiBar: readonly string[],
  phi: readonly string[],
  tape: readonly string[],
  accumulators: readonly string[],
): string {
  if (kind === "exponential") return `${accumulators[0]} += ${phiBar[0]} * (dt * ${phi[0]});`;
  const [p00, p01, p10, p11] = phiBar;
  const [, es, esl] = tape;
  const [a0, a1, a2, a3, a4, a5] = accumulators;
  return (
    `{ const ecl = 0.5 * dt * ${es}; const pd = ${p01} - ${p10}; const ps = ${p00} + ${p11}; const pm = ${p00} - ${p11};` +
    ` ${a0} += dt * (${p00} * ${phi[0]} + pd * ${phi[1]} + ${p11} * ${phi[3]});` +
    ` ${a1} += ps * ecl; ${a2} += pm * ${esl}; ${a3} += pd * ${esl}; ${a4} += pm * ${es}; ${a5} += pd * ${es}; }`
  );
}

const arrayElements = (array: string, offset: string, count: number): string[] =>
  Array.from({ length: count }, (_, e) => `${array}[${offset} + ${e}]`);

/** The exponential block's step of {@link accumulateBlockAdjoint}, compiled from its text. */
const exponentialAdjoint: (dt: number, phiBar: Float64Array, phi: Float64Array, phiOffset: number, accumulators: Float64Array, at: number) => void =
  compileHelper(
    ["dt", "phiBar", "phi", "phiOffset", "accumulators", "at"],
    `${accumulateBlockAdjointSource("exponential", ["phiBar[0]"], ["phi[phiOffset]"], [], ["accumulators[at]"])} return;`,
    {},
    (dt: number, phiBar: Float64Array, phi: Float64Array, phiOffset: number, accumulators: Float64Array, at: number) => {
      accumulators[at] += phiBar[0] * (dt * phi[phiOffset]);
    },
  );

/** The oscillator block's step of {@link accumulateBlockAdjoint}, compiled from its text. */
const oscillatorAdjointText = accumulateBlockAdjointSource(
  "oscillator",
  arrayElements("phiBar", "0", 4),
  arrayElements("phi", "phiOffset", 4),
  arrayElements("tape", "tapeOffset", 3),
  arrayElements("accumulators", "at", 6),
);
const oscillatorAdjoint: typeof oscillatorAdjointPlain = compileHelper(
  ["dt", "phiBar", "phi", "phiOffset", "tape", "tapeOffset", "accumulators", "at"],
  `${oscillatorAdjointText} return;`,
  {},
  oscillatorAdjointPlain,
);

/** The same step written plainly, for hosts without run-time compilation (where no written-out pass runs to agree with). */
function oscillatorAdjointPlain(
  dt: number,
  phiBar: Float64Array,
  phi: Float64Array,
  phiOffset: number,
  tape: Float64Array,
  tapeOffset: number,
  accumulators: Float64Array,
  at: number,
): void {
  const es = tape[tapeOffset + 1];
  const esl = tape[tapeOffset + 2];
  const pd = phiBar[1] - phiBar[2];
  const pm = phiBar[0] - phiBar[3];
  accumulators[at] += dt * (phiBar[0] * phi[phiOffset] + pd * phi[phiOffset + 1] + phiBar[3] * phi[phiOffset + 3]);
  accumulators[at + 1] += (phiBar[0] + phiBar[3]) * (0.5 * dt * es);
  accumulators[at + 2] += pm * esl;
  accumulators[at + 3] += pd * esl;
  accumulators[at + 4] += pm * es;
  accumulators[at + 5] += pd * es;
}

/** Maps a block's accumulators to the kernel gradient, once after the backward pass (see the file's comment). */
export function finishBlockAdjoint(kind: AdjointKind, block: TransitionBlock, accumulators: Float64Array, offset: number, kernelBar: Float64Array): void {
  if (kind === "exponential") {
    (block as ExponentialTransition).addRateGradient(-accumulators[offset], kernelBar);
  } else if (kind === "oscillator") {
    const o = block as OscillatorTransition;
    const c = o.halfWidth;
    const w0 = o.w0;
    const a = offset;
    const t = accumulators[a + 1] + c * accumulators[a + 2] + w0 * accumulators[a + 3];
    o.addNativeGradient(-accumulators[a] + 2 * c * t + accumulators[a + 4], -2 * w0 * t + accumulators[a + 5], kernelBar);
  }
}
