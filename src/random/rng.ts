import seedrandom from "seedrandom";

/**
 * An explicit source of randomness. Every stochastic routine in Horologium takes one of these as an
 * argument; nothing reads a global generator, so the same seed gives the same output bit for bit.
 */
export interface Rng {
  /** A uniform deviate in [0, 1) with 53 random bits. */
  uniform(): number;
  /** A standard normal deviate (mean 0, variance 1). */
  normal(): number;
  /** The seed this generator was created from (for provenance in results). */
  readonly seed: number | string;
}

/**
 * Creates a seeded generator: the xor4096 generator of the `seedrandom` package for uniforms, and the
 * Marsaglia polar method (Marsaglia & Bray 1964, SIAM Review 6, 260) for normals.
 *
 * @example const rng = createRng(42); const x = rng.normal();
 */
export function createRng(seed: number | string): Rng {
  const source = seedrandom.xor4096(String(seed));
  let spare = 0;
  let hasSpare = false;
  return {
    seed,
    uniform: () => source.double(),
    normal: () => {
      if (hasSpare) {
        hasSpare = false;
        return spare;
      }
      let u = 0;
      let v = 0;
      let s = 0;
      do {
        u = 2 * source.double() - 1;
        v = 2 * source.double() - 1;
        s = u * u + v * v;
      } while (s >= 1 || s === 0);
      const factor = Math.sqrt((-2 * Math.log(s)) / s);
      spare = v * factor;
      hasSpare = true;
      return u * factor;
    },
  };
}

/** Derives an independent child seed, for example one per walker, chain or worker, from a parent seed. */
export function childSeed(seed: number | string, index: number): string {
  return `${seed}/${index}`;
}
