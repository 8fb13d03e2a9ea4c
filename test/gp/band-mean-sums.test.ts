import { describe, expect, it } from "vitest";
import { bandMeanSums } from "../../src/gp/band-mean-sums.js";
import { createRng } from "../../src/random/rng.js";
import { COMPOSITE_CASES, FAMILY_CASES } from "../helpers/kernel-cases.js";
import { randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

describe("band-mean sums: the written-out recursion with band columns", () => {
  // Reference: the general loop of band-mean-sums.ts (itself checked, through MultiBandProcess.meanMarginal,
  // against the dense marginal covariance with ml-matrix in test/gp/multi-band-process.test.ts). The sums
  // are accumulated in another order, so the agreement is to rounding, not bit for bit.
  const rng = createRng("band-columns");
  const time = seasonalTimes(rng, { seasons: 3, perSeason: 1000 });
  const n = time.length;
  const errorVariance = Float64Array.from(randomErrors(rng, n), (e) => e * e);
  const values = Float64Array.from({ length: n }, () => 19 + 0.2 * rng.normal());
  const band = Int32Array.from({ length: n }, () => Math.floor(rng.uniform() * 5));
  const scaling = {
    band,
    inverse: Float64Array.from([1, 0.8, 1.25, -0.6, 0.4], (a) => 1 / a),
    shift: Float64Array.of(19, 19.1, 18.9, 19.3, 19),
    extra: Float64Array.of(0, 1e-4, 4e-4, 0, 1e-3),
  };
  it.each([...FAMILY_CASES, ...COMPOSITE_CASES])("%s: agrees with the general loop to 1e-12", (_, kernel) => {
    const form = kernel.semiseparableForm()!;
    const written = bandMeanSums(form, time, errorVariance, values, scaling);
    const general = bandMeanSums(form, time, errorVariance, values, scaling, { unrolled: false });
    expect(Math.abs(written.logDeterminant - general.logDeterminant)).toBeLessThan(1e-12 * Math.abs(general.logDeterminant));
    const scale = Math.max(...Array.from(general.gram, Math.abs));
    for (let i = 0; i < general.gram.length; i++) expect(Math.abs((written.gram[i] ?? NaN) - (general.gram[i] ?? NaN))).toBeLessThan(1e-12 * scale);
  });
});
