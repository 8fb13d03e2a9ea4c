import type { PosteriorTarget } from "../../src/inference/index.js";

/** The density a(x) + b(x) of two targets on the same space, in logs without overflow (a test target with several modes). */
export function sumOfTargets(a: PosteriorTarget, b: PosteriorTarget): PosteriorTarget {
  return {
    dimension: a.dimension,
    logPosterior: (x) => {
      const la = a.logPosterior(x);
      const lb = b.logPosterior(x);
      const top = Math.max(la, lb);
      return top + Math.log(Math.exp(la - top) + Math.exp(lb - top));
    },
  };
}
