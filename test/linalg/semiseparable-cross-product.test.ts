import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import { SemiseparableCrossProduct } from "../../src/linalg/semiseparable-cross-product.js";
import { createRng } from "../../src/random/rng.js";
import { seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: the sum g_j = sum_i k(t*_j - t_i) w_i written out term by term with the kernel's closed-form
// autocovariance (Kernel.covarianceAt).
describe("SemiseparableCrossProduct", () => {
  const families = [
    kernels.dampedRandomWalk({ sigma: 0.3, tau: 40 }),
    kernels.oscillator({ sigma: 0.2, period: 17, quality: 0.3 }).plus(kernels.matern32({ sigma: 0.1, scale: 9 })),
    kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 200 })),
  ];
  for (const kernel of families) {
    it(`agrees with the written-out sum to 1e-12 (${kernel.constructor.name}), ties and both ends included`, () => {
      const rng = createRng(`cross-product:${kernel.constructor.name}`);
      const time = seasonalTimes(rng, { seasons: 2, perSeason: 30 });
      const targets = Float64Array.from([-20, time[0], time[4], 300, time[59], 900]).sort();
      const product = new SemiseparableCrossProduct(kernel.semiseparableForm()!, time, targets);
      for (let trial = 0; trial < 2; trial++) {
        const weights = Float64Array.from(time, () => rng.normal());
        const g = product.apply(weights);
        for (let j = 0; j < targets.length; j++) {
          let expected = 0;
          let scale = 0;
          for (let i = 0; i < time.length; i++) {
            expected += kernel.covarianceAt(targets[j] - time[i]) * weights[i];
            scale += Math.abs(kernel.covarianceAt(targets[j] - time[i]) * weights[i]);
          }
          expect(Math.abs(g[j] - expected)).toBeLessThan(1e-12 * scale);
        }
      }
    });
  }
});
