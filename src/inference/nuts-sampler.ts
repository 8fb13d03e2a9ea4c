import { childSeed, createRng, type Rng } from "../random/rng.js";
import { DrawStore } from "./draw-store.js";
import { DualAveraging } from "./dual-averaging.js";
import { hasGradient, type DifferentiablePosteriorTarget, type PosteriorTarget } from "./posterior-target.js";
import type { MarkovSampler } from "./markov-sampler.js";
import { nutsTransition, type PhasePoint } from "./nuts-transition.js";
import { planWarmup, WindowSpread, type WarmupPlan } from "./warmup-schedule.js";

/** Options of {@link createNutsSampler}. */
export interface NutsSamplerOptions {
  /** Warm-up iterations per chain that adapt step size and mass matrix and are not kept (default 500). */
  readonly warmup?: number;
  /** Target mean acceptance statistic of the step-size adaptation (default 0.8, common practice). */
  readonly targetAcceptance?: number;
  /** Largest number of trajectory doublings (default 10, so at most 1023 leapfrog steps). */
  readonly maxTreeDepth?: number;
  /** Step size to start from; by default found by the heuristic of Hoffman & Gelman 2014, algorithm 4. */
  readonly initialStepSize?: number;
  /**
   * Diagonal of the inverse mass matrix before the first adaptation window (default all ones), for
   * example the squared scales of a Laplace approximation at the mode. Parameters whose scales differ
   * by orders of magnitude otherwise force tiny steps and 2^maxTreeDepth-step trajectories until the
   * first window ends.
   */
  readonly initialInverseMass?: Float64Array;
  /** Where the mass-matrix windows lie (default {@link planWarmup} of `warmup`); benchmarks compare plans. */
  readonly warmupPlan?: WarmupPlan;
}

interface ChainState {
  readonly rng: Rng;
  point: PhasePoint;
  stepSize: number;
  inverseMass: Float64Array;
  readonly adaptation: DualAveraging;
  readonly variance: WindowSpread;
}

/**
 * Step size from the heuristic of Hoffman & Gelman 2014 (JMLR 15, 1593, algorithm 4): double or halve
 * eps until the acceptance probability of a single leapfrog step crosses 1/2.
 */
function initialStepSize(
  target: DifferentiablePosteriorTarget,
  point: PhasePoint,
  inverseMass: Float64Array,
  rng: Rng,
  start = 1,
): number {
  const d = point.q.length;
  const p = new Float64Array(d);
  const q = new Float64Array(d);
  const g = new Float64Array(d);
  for (let i = 0; i < d; i++) p[i] = rng.normal() / Math.sqrt(inverseMass[i]);
  let h0 = -point.logPosterior;
  for (let i = 0; i < d; i++) h0 += 0.5 * p[i] * p[i] * inverseMass[i];
  const logAcceptance = (eps: number): number => {
    const pHalf = new Float64Array(d);
    for (let i = 0; i < d; i++) pHalf[i] = p[i] + 0.5 * eps * point.gradient[i];
    for (let i = 0; i < d; i++) q[i] = point.q[i] + eps * inverseMass[i] * pHalf[i];
    const logPosterior = target.logPosteriorAndGradient(q, g);
    if (!Number.isFinite(logPosterior)) return -Infinity;
    let h = -logPosterior;
    for (let i = 0; i < d; i++) {
      const pe = pHalf[i] + 0.5 * eps * g[i];
      h += 0.5 * pe * pe * inverseMass[i];
    }
    return Number.isFinite(h) ? h0 - h : -Infinity;
  };
  let eps = start;
  const direction = logAcceptance(eps) > Math.log(0.5) ? 1 : -1;
  for (let k = 0; k < 60; k++) {
    const la = logAcceptance(eps);
    if (direction === 1 ? !(la > Math.log(0.5)) : la > Math.log(0.5)) break;
    eps = direction === 1 ? eps * 2 : eps / 2;
  }
  return eps;
}

/**
 * Several independent chains of the no-U-turn sampler (Hoffman & Gelman 2014, JMLR 15, 1593). Each
 * chain has its own generator (seeded `childSeed(seed, chain)`), its own step size tuned by dual
 * averaging to the target acceptance statistic, and its own diagonal mass matrix, re-estimated from the
 * chain's draws at the end of each warm-up window ({@link planWarmup}) and followed by a fresh step-size
 * search. After warm-up the step size is the dual-averaging mean and stays fixed, and every iteration is
 * kept.
 *
 * @param initial one starting point per chain, each with a finite log density
 */
export function createNutsSampler(
  target: PosteriorTarget,
  initial: readonly Float64Array[],
  seed: number | string,
  options: NutsSamplerOptions = {},
): MarkovSampler {
  if (!hasGradient(target)) throw new RangeError("NUTS needs a target with a gradient");
  const d = target.dimension;
  const warmup = options.warmup ?? 500;
  const targetAcceptance = options.targetAcceptance ?? 0.8;
  const maxDepth = options.maxTreeDepth ?? 10;
  const plan = options.warmupPlan ?? planWarmup(warmup);
  const draws = new DrawStore(initial.length, d);
  const chains: ChainState[] = initial.map((q0, c) => {
    if (q0.length !== d) throw new RangeError(`NUTS: a starting point has ${q0.length} entries, expected ${d}`);
    const gradient = new Float64Array(d);
    const q = Float64Array.from(q0);
    const logPosterior = target.logPosteriorAndGradient(q, gradient);
    if (!Number.isFinite(logPosterior)) throw new RangeError(`NUTS: log density of chain ${c} at its start is ${logPosterior}`);
    const rng = createRng(childSeed(seed, c));
    const point: PhasePoint = { q, p: new Float64Array(d), gradient, logPosterior };
    const inverseMass = options.initialInverseMass ? Float64Array.from(options.initialInverseMass) : new Float64Array(d).fill(1);
    if (inverseMass.length !== d || !inverseMass.every((v) => v > 0 && Number.isFinite(v))) {
      throw new RangeError(`NUTS: the initial inverse mass needs ${d} positive finite entries`);
    }
    const stepSize = options.initialStepSize ?? initialStepSize(target, point, inverseMass, rng);
    return {
      rng,
      point,
      stepSize,
      inverseMass,
      adaptation: new DualAveraging(targetAcceptance, stepSize),
      variance: new WindowSpread(d),
    };
  });
  const positions: Float64Array[] = chains.map((c) => c.point.q);
  const logp = new Float64Array(chains.length);
  let iterations = 0;
  let acceptanceSum = 0;
  let divergences = 0;
  let warmupDivergences = 0;
  let depthSum = 0;
  let depthLimitHits = 0;
  let leapfrogSteps = 0;

  return {
    kind: "nuts",
    chainCount: chains.length,
    dimension: d,
    warmupIterations: warmup,
    draws,
    get iterations() {
      return iterations;
    },
    iterate() {
      const inWarmup = iterations < warmup;
      chains.forEach((chain, c) => {
        const step = nutsTransition(target, chain.point, chain.stepSize, chain.inverseMass, chain.rng, maxDepth);
        chain.point = step.point;
        leapfrogSteps += step.leapfrogSteps;
        if (inWarmup) {
          if (step.divergent) warmupDivergences++;
          chain.stepSize = chain.adaptation.update(step.acceptance);
          const window = plan.windowEnds.findIndex((end, w) => iterations >= plan.windowStarts[w] && iterations < end);
          if (window >= 0) {
            chain.variance.add(chain.point.q);
            if (iterations === plan.windowEnds[window] - 1) {
              chain.inverseMass = chain.variance.regularizedVariance(chain.inverseMass);
              chain.variance.reset();
              chain.stepSize = initialStepSize(target, chain.point, chain.inverseMass, chain.rng, chain.stepSize);
              chain.adaptation.restart(chain.stepSize);
            }
          }
          if (iterations === warmup - 1) chain.stepSize = chain.adaptation.finalStep();
        } else {
          acceptanceSum += step.acceptance;
          if (step.divergent) divergences++;
          depthSum += step.treeDepth;
          if (step.treeDepth >= maxDepth) depthLimitHits++;
        }
        positions[c] = chain.point.q;
        logp[c] = chain.point.logPosterior;
      });
      iterations++;
      if (!inWarmup) draws.append(positions, logp);
    },
    analysisStart() {
      return 0;
    },
    current() {
      return { positions: chains.map((c) => c.point.q), logPosterior: Float64Array.from(chains, (c) => c.point.logPosterior) };
    },
    acceptanceRate() {
      const kept = draws.length * chains.length;
      return kept > 0 ? acceptanceSum / kept : NaN;
    },
    details() {
      const kept = draws.length * chains.length;
      return {
        chains: chains.length,
        warmup,
        stepSizes: chains.map((c) => c.stepSize),
        inverseMassDiagonals: chains.map((c) => Array.from(c.inverseMass)),
        divergences,
        warmupDivergences,
        meanTreeDepth: kept > 0 ? depthSum / kept : NaN,
        treeDepthLimitHits: depthLimitHits,
        leapfrogSteps,
      };
    },
  };
}
