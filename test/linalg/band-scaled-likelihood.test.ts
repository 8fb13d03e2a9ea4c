import { describe, expect, it } from "vitest";
import { bandScaledLogLikelihood } from "../../src/linalg/band-scaled-likelihood.js";
import { semiseparableLogLikelihood } from "../../src/linalg/semiseparable-likelihood.js";
import { createRng } from "../../src/random/rng.js";
import { COMPOSITE_CASES, FAMILY_CASES } from "../helpers/kernel-cases.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: scaling the residuals and noise variances first and calling the engine's plain pass
// (semiseparableLogLikelihood, itself checked against dense ml-matrix Cholesky in
// test/gp/engine-vs-dense.test.ts and test/gp/multi-band-process.test.ts). The scaling inside the loop
// does the same operations in the same order, so the results must be identical, bit for bit.
describe("band-scaled likelihood pass", () => {
  const rng = createRng("band-scaled");
  const time = seasonalTimes(rng, { seasons: 4, perSeason: 900 }); // 3600 points: two chunks
  const n = time.length;
  const errorVariance = Float64Array.from(randomErrors(rng, n), (e) => e * e);
  const values = Float64Array.from({ length: n }, () => 19 + 0.2 * rng.normal());
  const band = Int32Array.from({ length: n }, () => Math.floor(rng.uniform() * 4));
  const scaling = {
    band,
    inverse: Float64Array.from([1, 0.8, 1.25, -0.6], (a) => 1 / a),
    shift: Float64Array.of(19, 19.1, 18.9, 19.3),
    extra: Float64Array.of(0, 1e-4, 4e-4, 0),
  };
  const scaledFirst = () => {
    const residual = new Float64Array(n);
    const noise = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const b = band[k];
      const w = scaling.inverse[b];
      residual[k] = (values[k] - scaling.shift[b]) * w;
      noise[k] = (errorVariance[k] + scaling.extra[b]) * w * w;
    }
    return { residual, noise };
  };

  it.each([...FAMILY_CASES, ...COMPOSITE_CASES])("%s: identical to scaling first, written out and general loop alike", (_, kernel) => {
    const form = kernel.semiseparableForm()!;
    const { residual, noise } = scaledFirst();
    const reference = semiseparableLogLikelihood(form, time, noise, residual);
    for (const unrolled of [true, false]) expect(bandScaledLogLikelihood(form, time, errorVariance, values, scaling, { unrolled })).toBe(reference);
  });
});
