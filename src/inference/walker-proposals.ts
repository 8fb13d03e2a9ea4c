import type { Rng } from "../random/rng.js";

/**
 * A proposal for one walker of an affine-invariant ensemble, built from the walker's position and the
 * positions of the complementary half of the ensemble. Writes the proposal into `out` and returns the
 * log of the factor that multiplies p(proposal)/p(current) in the acceptance probability.
 */
export interface WalkerProposal {
  readonly name: string;
  propose(current: Float64Array, complement: readonly Float64Array[], rng: Rng, out: Float64Array): number;
}

/**
 * The stretch move of Goodman & Weare 2010 (CAMCoS 5, 65, eq. 7-10): y = x_j + z (x - x_j) with x_j a
 * random walker of the complement and z drawn from g(z) proportional to 1/sqrt(z) on [1/a, a]
 * (by inverse CDF, z = ((a - 1) u + 1)^2 / a); accepted with probability min(1, z^(d-1) p(y)/p(x)).
 *
 * @param a the stretch scale; 2 is the value Goodman & Weare recommend
 */
export function stretchProposal(a = 2): WalkerProposal {
  if (!(a > 1)) throw new RangeError(`stretch move: scale a must exceed 1, got ${a}`);
  return {
    name: `stretch(a=${a})`,
    propose(current, complement, rng, out) {
      const d = current.length;
      const partner = complement[Math.floor(rng.uniform() * complement.length)];
      const root = (a - 1) * rng.uniform() + 1;
      const z = (root * root) / a;
      for (let i = 0; i < d; i++) out[i] = partner[i] + z * (current[i] - partner[i]);
      return (d - 1) * Math.log(z);
    },
  };
}

/**
 * The differential-evolution move of ter Braak 2006 (Stat. Comput. 16, 239): y = x + gamma (x_j - x_k)
 * + e, with x_j != x_k two random walkers of the complement. The proposal is symmetric (swapping j and
 * k reverses it), so the acceptance probability is min(1, p(y)/p(x)). ter Braak's gamma = 2.38 /
 * sqrt(2 d) is optimal for Gaussian targets; gamma = 1 lets walkers jump between modes. The small
 * e ~ N(0, (jitter |x_j - x_k|)^2) per coordinate keeps the chain irreducible.
 *
 * @param options `gamma`, the scale of the difference vector (default 2.38 / sqrt(2 d)); `jitter`, the relative
 *   spread of e (default 1e-4)
 */
export function differentialEvolutionProposal(options: { gamma?: number; jitter?: number } = {}): WalkerProposal {
  const jitter = options.jitter ?? 1e-4;
  const gammaOption = options.gamma;
  if (gammaOption !== undefined && !(gammaOption > 0)) {
    throw new RangeError(`differential-evolution move: gamma must be positive, got ${gammaOption}`);
  }
  return {
    name: `differential-evolution(gamma=${gammaOption ?? "2.38/sqrt(2d)"})`,
    propose(current, complement, rng, out) {
      const d = current.length;
      const gamma = gammaOption ?? 2.38 / Math.sqrt(2 * d);
      const m = complement.length;
      const j = Math.floor(rng.uniform() * m);
      let k = Math.floor(rng.uniform() * (m - 1));
      if (k >= j) k++;
      const xj = complement[j];
      const xk = complement[k];
      for (let i = 0; i < d; i++) {
        const diff = xj[i] - xk[i];
        out[i] = current[i] + gamma * diff + jitter * Math.abs(diff) * rng.normal();
      }
      return 0;
    },
  };
}

/** A move with its probability of being chosen for an iteration. */
export interface WeightedProposal {
  readonly proposal: WalkerProposal;
  readonly weight: number;
}

/**
 * The default mixture: differential-evolution steps at ter Braak's scale, and one iteration in ten with
 * gamma = 1 so walkers can pass between separated modes (ter Braak 2006, sec. 3, suggests gamma = 1
 * every tenth generation). On the correlated Gaussian and banana targets of the tests this needed 2 to
 * 4 times fewer evaluations to converge than the stretch move alone, and a fifth of stretch moves in
 * the mixture did not help (three seeds each); the stretch move stays available for mixtures.
 */
export function defaultWalkerProposals(): WeightedProposal[] {
  return [
    { proposal: differentialEvolutionProposal(), weight: 0.9 },
    { proposal: differentialEvolutionProposal({ gamma: 1 }), weight: 0.1 },
  ];
}
