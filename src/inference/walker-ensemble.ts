import type { Rng } from "../random/rng.js";
import { DrawStore } from "./draw-store.js";
import { defaultWalkerProposals, type WeightedProposal } from "./walker-proposals.js";
import type { PosteriorTarget } from "./posterior-target.js";
import type { MarkovSampler } from "./markov-sampler.js";

/** Options of {@link createWalkerEnsemble}. */
export interface WalkerEnsembleOptions {
  /** The proposals and their weights (default {@link defaultWalkerProposals}). */
  readonly proposals?: readonly WeightedProposal[];
}

/**
 * The default ensemble size: max(16, 4 d) walkers rounded up to an even number. Goodman & Weare 2010
 * need more walkers than dimensions for the ensemble to span the space; a few times d is common practice.
 */
export function defaultWalkerCount(dimension: number): number {
  const n = Math.max(16, 4 * dimension);
  return n + (n % 2);
}

/**
 * An affine-invariant ensemble sampler (Goodman & Weare 2010, CAMCoS 5, 65) in its parallel form:
 * each iteration updates the first half of the walkers with moves built from the second half, then
 * the second half from the updated first half, which keeps the ensemble's joint stationary
 * distribution (Goodman & Weare 2010, sec. 3). One move of the mixture is drawn per half-iteration.
 * Every iteration keeps every walker's position; `analysisStart` discards the first half as burn-in
 * (Gelman et al., Bayesian Data Analysis, 3rd ed., sec. 11.4 discard the first half as warm-up).
 *
 * @param initial one starting position per walker (an even number, at least 4 and at least 2 d),
 *   each with a finite log density
 */
export function createWalkerEnsemble(
  target: PosteriorTarget,
  initial: readonly Float64Array[],
  rng: Rng,
  options: WalkerEnsembleOptions = {},
): MarkovSampler {
  const d = target.dimension;
  const walkers = initial.length;
  if (walkers % 2 !== 0 || walkers < Math.max(4, 2 * d)) {
    throw new RangeError(`ensemble sampler: needs an even number of at least max(4, 2d) = ${Math.max(4, 2 * d)} walkers, got ${walkers}`);
  }
  const moves = options.proposals ?? defaultWalkerProposals();
  const totalWeight = moves.reduce((s, m) => s + m.weight, 0);
  if (moves.length === 0 || !(totalWeight > 0)) throw new RangeError("ensemble sampler: needs moves with positive weight");
  const positions = initial.map((x) => {
    if (x.length !== d) throw new RangeError(`ensemble sampler: a starting point has ${x.length} entries, expected ${d}`);
    return Float64Array.from(x);
  });
  const logp = Float64Array.from(positions, (x) => target.logPosterior(x));
  logp.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new RangeError(`ensemble sampler: log density of walker ${i} at its start is ${v}`);
  });
  const half = walkers / 2;
  const draws = new DrawStore(walkers, d);
  const proposal = new Float64Array(d);
  const accepted = new Float64Array(moves.length);
  const proposed = new Float64Array(moves.length);
  let iterations = 0;
  let keptAccepted = 0;

  const pickMove = (): number => {
    let u = rng.uniform() * totalWeight;
    for (let i = 0; i < moves.length; i++) {
      u -= moves[i].weight;
      if (u < 0) return i;
    }
    return moves.length - 1;
  };

  const updateHalf = (first: number, complement: readonly Float64Array[]): number => {
    const which = pickMove();
    const move = moves[which].proposal;
    let acceptedHere = 0;
    for (let w = first; w < first + half; w++) {
      const logFactor = move.propose(positions[w], complement, rng, proposal);
      const candidate = target.logPosterior(proposal);
      const logRatio = logFactor + candidate - logp[w];
      // Compare in logs; NaN or -Infinity candidates are never accepted.
      if (candidate > -Infinity && (logRatio >= 0 || Math.log(rng.uniform()) < logRatio)) {
        positions[w].set(proposal);
        logp[w] = candidate;
        acceptedHere++;
      }
    }
    proposed[which] = proposed[which] + half;
    accepted[which] = accepted[which] + acceptedHere;
    return acceptedHere;
  };

  return {
    kind: "ensemble",
    chainCount: walkers,
    dimension: d,
    warmupIterations: 0,
    draws,
    get iterations() {
      return iterations;
    },
    iterate() {
      // The complement is snapshotted by reference: the half being updated is disjoint from it.
      const n = updateHalf(0, positions.slice(half)) + updateHalf(half, positions.slice(0, half));
      draws.append(positions, logp);
      iterations++;
      keptAccepted += n;
    },
    analysisStart() {
      return Math.floor(draws.length / 2);
    },
    current() {
      return { positions, logPosterior: logp };
    },
    acceptanceRate() {
      return iterations > 0 ? keptAccepted / (iterations * walkers) : NaN;
    },
    details() {
      return {
        walkers,
        proposals: moves.map((m, i) => ({
          proposal: m.proposal.name,
          weight: m.weight / totalWeight,
          acceptance: proposed[i] > 0 ? accepted[i] / proposed[i] : null,
        })),
      };
    },
  };
}
