import { childSeed, createRng, type Rng } from "../random/rng.js";
import { DrawStore } from "./draw-store.js";
import { DualAveraging } from "./dual-averaging.js";
import { hasGradient, type DifferentiablePosteriorTarget, type PosteriorTarget } from "./posterior-target.js";
import type { MarkovSampler } from "./markov-sampler.js";
import { nutsTransition, type PhasePoint } from "./nuts-transition.js";
import { nextInverseMass, WindowDraws, type AdaptedMass } from "./warmup-mass.js";
import { planWarmup, type WarmupPlan } from "./warmup-schedule.js";

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
   * Diagonal of the inverse mass matrix to start from (default all ones), for example the squared
   * curvature scales at the mode; kept until a warm-up window contradicts it (`nextInverseMass` in warmup-mass.ts).
   * Parameters whose scales differ by orders of magnitude otherwise force tiny steps and
   * 2^maxTreeDepth-step trajectories until the windows have corrected the scales.
   */
  readonly initialInverseMass?: Float64Array;
  /** Where the mass-matrix windows lie (default {@link planWarmup} of `warmup`); benchmarks compare plans. */
  readonly warmupPlan?: WarmupPlan;
}

interface ChainState {
  readonly rng: Rng;
  point: PhasePoint;
  stepSize: number;
  readonly adaptation: DualAveraging;
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
 * Several chains of the no-U-turn sampler (Hoffman & Gelman 2014, JMLR 15, 1593). Each chain has its
 * own generator (seeded `childSeed(seed, chain)`) and its own step size tuned by dual averaging to the
 * target acceptance statistic; the diagonal mass matrix is one for all chains, updated from the pooled
 * draws of all chains at the end of each warm-up window ({@link planWarmup}; `nextInverseMass` in warmup-mass.ts),
 * and a change that contradicts the previous one is followed by a fresh step-size search in every chain.
 * After warm-up the step size is the dual-averaging mean and stays fixed, and every iteration is kept.
 * `details()` reports, besides the adapted values, the leapfrog steps of the warm-up and how many
 * windows restarted the step size (`stepSizeRestarts`).
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
  for (let w = 0; w < plan.windowEnds.length; w++) {
    if (!(plan.windowStarts[w] < plan.windowEnds[w] && plan.windowEnds[w] < warmup)) {
      throw new RangeError(`NUTS: warm-up window ${w} must end after it starts and before the last warm-up iteration`);
    }
  }
  const startMass = options.initialInverseMass ? Float64Array.from(options.initialInverseMass) : new Float64Array(d).fill(1);
  if (startMass.length !== d || !startMass.every((v) => v > 0 && Number.isFinite(v))) {
    throw new RangeError(`NUTS: the initial inverse mass needs ${d} positive finite entries`);
  }
  // One mass matrix for all chains: each window's draws of all chains are pooled to update it.
  let mass: AdaptedMass = { inverseMass: startMass, support: new Float64Array(d), restart: false };
  const windowDraws = new WindowDraws(initial.length, d);
  const draws = new DrawStore(initial.length, d);
  const chains: ChainState[] = initial.map((q0, c) => {
    if (q0.length !== d) throw new RangeError(`NUTS: a starting point has ${q0.length} entries, expected ${d}`);
    const gradient = new Float64Array(d);
    const q = Float64Array.from(q0);
    const logPosterior = target.logPosteriorAndGradient(q, gradient);
    if (!Number.isFinite(logPosterior)) throw new RangeError(`NUTS: log density of chain ${c} at its start is ${logPosterior}`);
    const rng = createRng(childSeed(seed, c));
    const point: PhasePoint = { q, p: new Float64Array(d), gradient, logPosterior };
    const stepSize = options.initialStepSize ?? initialStepSize(target, point, startMass, rng);
    return {
      rng,
      point,
      stepSize,
      adaptation: new DualAveraging(targetAcceptance, stepSize),
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
  let warmupLeapfrogSteps = 0;
  let stepSizeRestarts = 0;

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
      const openWindow = inWarmup ? plan.windowEnds.findIndex((end, w) => iterations >= plan.windowStarts[w] && iterations < end) : -1;
      chains.forEach((chain, c) => {
        const step = nutsTransition(target, chain.point, chain.stepSize, mass.inverseMass, chain.rng, maxDepth);
        chain.point = step.point;
        leapfrogSteps += step.leapfrogSteps;
        if (inWarmup) {
          warmupLeapfrogSteps += step.leapfrogSteps;
          if (step.divergent) warmupDivergences++;
          chain.stepSize = chain.adaptation.update(step.acceptance);
          if (openWindow >= 0) windowDraws.add(c, chain.point.q);
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
      if (openWindow >= 0 && iterations === plan.windowEnds[openWindow] - 1) {
        mass = nextInverseMass(mass, windowDraws.estimates());
        windowDraws.reset();
        if (mass.restart) {
          stepSizeRestarts++;
          for (const chain of chains) {
            chain.stepSize = initialStepSize(target, chain.point, mass.inverseMass, chain.rng, chain.stepSize);
            chain.adaptation.restart(chain.stepSize);
          }
        }
      }
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
        inverseMassDiagonals: chains.map(() => Array.from(mass.inverseMass)),
        divergences,
        warmupDivergences,
        meanTreeDepth: kept > 0 ? depthSum / kept : NaN,
        treeDepthLimitHits: depthLimitHits,
        leapfrogSteps,
        warmupLeapfrogSteps,
        stepSizeRestarts,
      };
    },
  };
}
