import type { Rng } from "../random/rng.js";
import type { DifferentiablePosteriorTarget } from "./posterior-target.js";

/** A point of phase space with the log density and its gradient at the position. */
export interface PhasePoint {
  readonly q: Float64Array;
  readonly p: Float64Array;
  readonly gradient: Float64Array;
  readonly logPosterior: number;
}

/** What one NUTS transition did. */
export interface NutsTransition {
  /** The new state (momentum is not kept between transitions). */
  readonly point: PhasePoint;
  /** Mean Metropolis acceptance statistic over the trajectory, min(1, exp(H0 - H)) averaged (the adaptation signal). */
  readonly acceptance: number;
  /** Doublings of the trajectory. */
  readonly treeDepth: number;
  readonly leapfrogSteps: number;
  /** True when the energy error exceeded 1000 somewhere on the trajectory. */
  readonly divergent: boolean;
}

interface Subtree {
  /** Points at the two ends in the order they were built. */
  begin: PhasePoint;
  end: PhasePoint;
  sharpBegin: Float64Array;
  sharpEnd: Float64Array;
  /** Sum of the momenta over the subtree. */
  rho: Float64Array;
  /** ln of the summed weights exp(H0 - H) of the subtree's points. */
  logWeight: number;
  /** The point drawn from the subtree, with probability proportional to its weight. */
  proposal: PhasePoint;
}

interface TreeStats {
  leapfrogSteps: number;
  acceptanceSum: number;
  divergent: boolean;
}

const MAX_ENERGY_ERROR = 1000;

function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  const m = Math.max(a, b);
  return m + Math.log(Math.exp(a - m) + Math.exp(b - m));
}

/** What every stage of one transition shares: the target, the mass matrix, the generator, H0 and the running statistics. */
interface Trajectory {
  readonly target: DifferentiablePosteriorTarget;
  /** Diagonal of M^-1. */
  readonly inverseMass: Float64Array;
  readonly rng: Rng;
  /** The Hamiltonian at the start, -log p(q0) + K(p0). */
  readonly h0: number;
  readonly stats: TreeStats;
}

/** K(p) = p^T M^-1 p / 2. */
function kineticEnergy(p: Float64Array, inverseMass: Float64Array): number {
  let k = 0;
  for (let i = 0; i < p.length; i++) k += p[i] * p[i] * inverseMass[i];
  return 0.5 * k;
}

/** p# = M^-1 p. */
function sharpMomentum(p: Float64Array, inverseMass: Float64Array): Float64Array {
  const out = new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) out[i] = inverseMass[i] * p[i];
  return out;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function sum(a: Float64Array, b: Float64Array): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i] + b[i];
  return out;
}

/** The generalised no-U-turn criterion for a trajectory with end momenta p#_a, p#_b and momentum sum rho. */
function noUTurn(sharpA: Float64Array, sharpB: Float64Array, rho: Float64Array): boolean {
  return dot(sharpA, rho) > 0 && dot(sharpB, rho) > 0;
}

/** One leapfrog step of size eps (negative: backwards in time); the final half kick only where log p is finite. */
function leapfrog(trajectory: Trajectory, from: PhasePoint, eps: number): PhasePoint {
  const { inverseMass } = trajectory;
  const d = from.q.length;
  const p = new Float64Array(d);
  const q = new Float64Array(d);
  const gradient = new Float64Array(d);
  for (let i = 0; i < d; i++) p[i] = from.p[i] + 0.5 * eps * from.gradient[i];
  for (let i = 0; i < d; i++) q[i] = from.q[i] + eps * inverseMass[i] * p[i];
  const logPosterior = trajectory.target.logPosteriorAndGradient(q, gradient);
  if (Number.isFinite(logPosterior)) {
    for (let i = 0; i < d; i++) p[i] = p[i] + 0.5 * eps * gradient[i];
  }
  return { q, p, gradient, logPosterior };
}

/**
 * The subtree of depth 0: one leapfrog step, its acceptance statistic counted; null when the energy error
 * exceeds `MAX_ENERGY_ERROR` (a divergence).
 */
function singleStepSubtree(trajectory: Trajectory, from: PhasePoint, eps: number): Subtree | null {
  const { h0, stats } = trajectory;
  const point = leapfrog(trajectory, from, eps);
  let h = -point.logPosterior + kineticEnergy(point.p, trajectory.inverseMass);
  if (Number.isNaN(h) || !Number.isFinite(point.logPosterior)) h = Infinity;
  stats.leapfrogSteps++;
  stats.acceptanceSum += h0 - h > 0 ? 1 : Math.exp(h0 - h);
  if (h - h0 > MAX_ENERGY_ERROR) {
    stats.divergent = true;
    return null;
  }
  const s = sharpMomentum(point.p, trajectory.inverseMass);
  return { begin: point, end: point, sharpBegin: s, sharpEnd: s, rho: Float64Array.from(point.p), logWeight: h0 - h, proposal: point };
}

/**
 * A subtree of 2^depth leapfrog steps from `from` (Hoffman & Gelman 2014, algorithm 3, with multinomial
 * sampling within it): two halves built one after the other, the proposal drawn between them in proportion
 * to their weights; null when a half diverged or turned, or the whole turns (also across the junction).
 */
function buildSubtree(trajectory: Trajectory, from: PhasePoint, depth: number, eps: number): Subtree | null {
  if (depth === 0) return singleStepSubtree(trajectory, from, eps);
  const first = buildSubtree(trajectory, from, depth - 1, eps);
  if (first === null) return null;
  const second = buildSubtree(trajectory, first.end, depth - 1, eps);
  if (second === null) return null;
  const logWeight = logAddExp(first.logWeight, second.logWeight);
  const proposal = trajectory.rng.uniform() < Math.exp(second.logWeight - logWeight) ? second.proposal : first.proposal;
  const rho = sum(first.rho, second.rho);
  const persists =
    noUTurn(first.sharpBegin, second.sharpEnd, rho) &&
    noUTurn(first.sharpBegin, second.sharpBegin, sum(first.rho, second.begin.p)) &&
    noUTurn(first.sharpEnd, second.sharpEnd, sum(second.rho, first.end.p));
  if (!persists) return null;
  return { begin: first.begin, end: second.end, sharpBegin: first.sharpBegin, sharpEnd: second.sharpEnd, rho, logWeight, proposal };
}

/** The whole trajectory so far: its two ends with their p#, the momentum sum, the log of the summed weights and the state drawn. */
interface TrajectoryState {
  left: PhasePoint;
  right: PhasePoint;
  sharpLeft: Float64Array;
  sharpRight: Float64Array;
  rho: Float64Array;
  logWeight: number;
  sample: PhasePoint;
}

/**
 * Joins a new subtree to the trajectory on the side it was built (forward: right): the biased progressive
 * draw of the state (move to the new subtree with probability min(1, w_new / w_old); Betancourt 2017,
 * appendix A), the new end and momentum sum; returns whether the merged trajectory still makes no U-turn,
 * checked in trajectory order across the junction too.
 */
function extendTrajectory(state: TrajectoryState, subtree: Subtree, forward: boolean, rng: Rng): boolean {
  if (subtree.logWeight > state.logWeight || rng.uniform() < Math.exp(subtree.logWeight - state.logWeight)) {
    state.sample = subtree.proposal;
  }
  state.logWeight = logAddExp(state.logWeight, subtree.logWeight);
  const oldRho = state.rho;
  state.rho = sum(oldRho, subtree.rho);
  let persists: boolean;
  if (forward) {
    persists =
      noUTurn(state.sharpLeft, subtree.sharpEnd, state.rho) &&
      noUTurn(state.sharpLeft, subtree.sharpBegin, sum(oldRho, subtree.begin.p)) &&
      noUTurn(state.sharpRight, subtree.sharpEnd, sum(subtree.rho, state.right.p));
    state.right = subtree.end;
    state.sharpRight = subtree.sharpEnd;
  } else {
    persists =
      noUTurn(subtree.sharpEnd, state.sharpRight, state.rho) &&
      noUTurn(subtree.sharpEnd, state.sharpLeft, sum(subtree.rho, state.left.p)) &&
      noUTurn(subtree.sharpBegin, state.sharpRight, sum(oldRho, subtree.begin.p));
    state.left = subtree.end;
    state.sharpLeft = subtree.sharpEnd;
  }
  return persists;
}

/**
 * One transition of the no-U-turn sampler (Hoffman & Gelman 2014, JMLR 15, 1593) with a diagonal
 * mass matrix M (given by its inverse). The trajectory doubles forwards or backwards at random until it
 * makes a U-turn, diverges or reaches 2^maxDepth leapfrog steps. Two refinements of the original
 * slice-sampling scheme are used: the next state is drawn from the trajectory with probability
 * proportional to exp(-H) (multinomial sampling, with the bias towards the newest subtree of
 * Betancourt 2017, arXiv:1701.02434, appendix A), and the U-turn test uses the sum of momenta rho with
 * p# = M^-1 p: a (sub)trajectory turns when p#_left . rho <= 0 or p#_right . rho <= 0, checked also
 * across each merged pair of subtrees so that turns at their junction are caught (common practice).
 * Stages: a fresh momentum, then per doubling `buildSubtree` and `extendTrajectory`.
 */
export function nutsTransition(
  target: DifferentiablePosteriorTarget,
  start: PhasePoint,
  stepSize: number,
  inverseMass: Float64Array,
  rng: Rng,
  maxDepth: number,
): NutsTransition {
  const d = start.q.length;
  const p0 = new Float64Array(d);
  for (let i = 0; i < d; i++) p0[i] = rng.normal() / Math.sqrt(inverseMass[i]);
  const origin: PhasePoint = { q: start.q, p: p0, gradient: start.gradient, logPosterior: start.logPosterior };
  const stats: TreeStats = { leapfrogSteps: 0, acceptanceSum: 0, divergent: false };
  const trajectory: Trajectory = { target, inverseMass, rng, h0: -start.logPosterior + kineticEnergy(p0, inverseMass), stats };

  const sharpOrigin = sharpMomentum(p0, inverseMass);
  const state: TrajectoryState = {
    left: origin,
    right: origin,
    sharpLeft: sharpOrigin,
    sharpRight: sharpOrigin,
    rho: Float64Array.from(p0),
    logWeight: 0,
    sample: origin,
  };
  let depth = 0;
  while (depth < maxDepth) {
    const forward = rng.uniform() < 0.5;
    const subtree = forward ? buildSubtree(trajectory, state.right, depth, stepSize) : buildSubtree(trajectory, state.left, depth, -stepSize);
    if (subtree === null) break;
    depth++;
    if (!extendTrajectory(state, subtree, forward, rng)) break;
  }
  return {
    point: state.sample,
    acceptance: stats.leapfrogSteps > 0 ? stats.acceptanceSum / stats.leapfrogSteps : 0,
    treeDepth: depth,
    leapfrogSteps: stats.leapfrogSteps,
    divergent: stats.divergent,
  };
}
