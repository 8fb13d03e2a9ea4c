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

/**
 * One transition of the no-U-turn sampler (Hoffman & Gelman 2014, JMLR 15, 1593) with a diagonal
 * mass matrix M (given by its inverse). The trajectory doubles forwards or backwards at random until it
 * makes a U-turn, diverges or reaches 2^maxDepth leapfrog steps. Two refinements of the original
 * slice-sampling scheme are used: the next state is drawn from the trajectory with probability
 * proportional to exp(-H) (multinomial sampling, with the bias towards the newest subtree of
 * Betancourt 2017, arXiv:1701.02434, appendix A), and the U-turn test uses the sum of momenta rho with
 * p# = M^-1 p: a (sub)trajectory turns when p#_left . rho <= 0 or p#_right . rho <= 0, checked also
 * across each merged pair of subtrees so that turns at their junction are caught (common practice).
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
  for (let i = 0; i < d; i++) p0[i] = rng.normal() / Math.sqrt(inverseMass[i]!);
  const kinetic = (p: Float64Array): number => {
    let k = 0;
    for (let i = 0; i < d; i++) k += p[i]! * p[i]! * inverseMass[i]!;
    return 0.5 * k;
  };
  const sharp = (p: Float64Array): Float64Array => {
    const out = new Float64Array(d);
    for (let i = 0; i < d; i++) out[i] = inverseMass[i]! * p[i]!;
    return out;
  };
  const dot = (a: Float64Array, b: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < d; i++) s += a[i]! * b[i]!;
    return s;
  };
  const sum = (a: Float64Array, b: Float64Array): Float64Array => {
    const out = new Float64Array(d);
    for (let i = 0; i < d; i++) out[i] = a[i]! + b[i]!;
    return out;
  };
  const noUTurn = (sharpA: Float64Array, sharpB: Float64Array, rho: Float64Array): boolean =>
    dot(sharpA, rho) > 0 && dot(sharpB, rho) > 0;

  const origin: PhasePoint = { q: start.q, p: p0, gradient: start.gradient, logPosterior: start.logPosterior };
  const h0 = -start.logPosterior + kinetic(p0);
  const stats: TreeStats = { leapfrogSteps: 0, acceptanceSum: 0, divergent: false };

  const leapfrog = (from: PhasePoint, eps: number): PhasePoint => {
    const p = new Float64Array(d);
    const q = new Float64Array(d);
    const gradient = new Float64Array(d);
    for (let i = 0; i < d; i++) p[i] = from.p[i]! + 0.5 * eps * from.gradient[i]!;
    for (let i = 0; i < d; i++) q[i] = from.q[i]! + eps * inverseMass[i]! * p[i]!;
    const logPosterior = target.logPosteriorAndGradient(q, gradient);
    if (Number.isFinite(logPosterior)) {
      for (let i = 0; i < d; i++) p[i] = p[i]! + 0.5 * eps * gradient[i]!;
    }
    return { q, p, gradient, logPosterior };
  };

  const build = (from: PhasePoint, depth: number, eps: number): Subtree | null => {
    if (depth === 0) {
      const point = leapfrog(from, eps);
      let h = -point.logPosterior + kinetic(point.p);
      if (Number.isNaN(h) || !Number.isFinite(point.logPosterior)) h = Infinity;
      stats.leapfrogSteps++;
      stats.acceptanceSum += h0 - h > 0 ? 1 : Math.exp(h0 - h);
      if (h - h0 > MAX_ENERGY_ERROR) {
        stats.divergent = true;
        return null;
      }
      const s = sharp(point.p);
      return {
        begin: point,
        end: point,
        sharpBegin: s,
        sharpEnd: s,
        rho: Float64Array.from(point.p),
        logWeight: h0 - h,
        proposal: point,
      };
    }
    const first = build(from, depth - 1, eps);
    if (first === null) return null;
    const second = build(first.end, depth - 1, eps);
    if (second === null) return null;
    const logWeight = logAddExp(first.logWeight, second.logWeight);
    const proposal = rng.uniform() < Math.exp(second.logWeight - logWeight) ? second.proposal : first.proposal;
    const rho = sum(first.rho, second.rho);
    const persists =
      noUTurn(first.sharpBegin, second.sharpEnd, rho) &&
      noUTurn(first.sharpBegin, second.sharpBegin, sum(first.rho, second.begin.p)) &&
      noUTurn(first.sharpEnd, second.sharpEnd, sum(second.rho, first.end.p));
    if (!persists) return null;
    return {
      begin: first.begin,
      end: second.end,
      sharpBegin: first.sharpBegin,
      sharpEnd: second.sharpEnd,
      rho,
      logWeight,
      proposal,
    };
  };

  let left = origin;
  let right = origin;
  let sharpLeft = sharp(p0);
  let sharpRight = sharpLeft;
  let rho: Float64Array = Float64Array.from(p0);
  let logWeight = 0;
  let sample: PhasePoint = origin;
  let depth = 0;
  while (depth < maxDepth) {
    const forward = rng.uniform() < 0.5;
    const subtree = forward ? build(right, depth, stepSize) : build(left, depth, -stepSize);
    if (subtree === null) break;
    depth++;
    // Biased progressive sampling: move to the new subtree with probability min(1, w_new / w_old).
    if (subtree.logWeight > logWeight || rng.uniform() < Math.exp(subtree.logWeight - logWeight)) {
      sample = subtree.proposal;
    }
    logWeight = logAddExp(logWeight, subtree.logWeight);
    // In trajectory order: the backward part and the forward part of the merged tree.
    const oldRho = rho;
    rho = sum(oldRho, subtree.rho);
    let persists: boolean;
    if (forward) {
      persists =
        noUTurn(sharpLeft, subtree.sharpEnd, rho) &&
        noUTurn(sharpLeft, subtree.sharpBegin, sum(oldRho, subtree.begin.p)) &&
        noUTurn(sharpRight, subtree.sharpEnd, sum(subtree.rho, right.p));
      right = subtree.end;
      sharpRight = subtree.sharpEnd;
    } else {
      persists =
        noUTurn(subtree.sharpEnd, sharpRight, rho) &&
        noUTurn(subtree.sharpEnd, sharpLeft, sum(subtree.rho, left.p)) &&
        noUTurn(subtree.sharpBegin, sharpRight, sum(oldRho, subtree.begin.p));
      left = subtree.end;
      sharpLeft = subtree.sharpEnd;
    }
    if (!persists) break;
  }
  return {
    point: sample,
    acceptance: stats.leapfrogSteps > 0 ? stats.acceptanceSum / stats.leapfrogSteps : 0,
    treeDepth: depth,
    leapfrogSteps: stats.leapfrogSteps,
    divergent: stats.divergent,
  };
}
