import { describe, expect, it } from "vitest";
import { bandColumns, expectedMoves, mergeBands, reshiftMerge } from "../../src/gp/band-merge.js";
import { MultiBandProcess } from "../../src/gp/multi-band-process.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { createRng } from "../../src/random/rng.js";
import { denseMeanMarginal, denseMultiBand, type DenseBand } from "../helpers/dense-multi-band.js";
import { COMPOSITE_CASES, FAMILY_CASES } from "../helpers/kernel-cases.js";
import { maxRelativeDifference, randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: the covariance a_i a_j k(t_i - l_i - t_j + l_j) + noise written out densely and factorised by
// ml-matrix's Cholesky (a general-purpose linear-algebra library), with the gradient of Rasmussen &
// Williams 2006, eq. 5.9, and their prediction equations 2.25-2.26 (test/helpers/dense-multi-band.ts).
const families: Array<[string, Kernel]> = [
  ...FAMILY_CASES,
  ["carma(2,1)", kernels.carma({ sigma: 0.2, oscillations: [{ period: 60, quality: 0.9 }], movingAverage: [4] })],
  ["carma(3,0)", kernels.carma({ sigma: 0.2, oscillations: [{ period: 45, quality: 2 }], timescales: [200] })],
  ...COMPOSITE_CASES,
];

/** Three unevenly sampled bands (60, 21 and 37 points) with different depths. */
function threeBands(seed: string) {
  const rng = createRng(seed);
  const perSeason = [20, 7, 13];
  const depths = [[0.01, 0.03], [0.03, 0.08], [0.02, 0.05]];
  const bands: DenseBand[] = perSeason.map((count, b) => {
    const time = seasonalTimes(rng, { seasons: 3, perSeason: count, start: b * 0.37 });
    const errors = randomErrors(rng, time.length, depths[b][0], depths[b][1]);
    const values = Float64Array.from(time, () => 0.3 * rng.normal() + 19 + b * 0.2);
    return { time, errors, values };
  });
  return bands;
}

const parameters = (lags: boolean) => ({
  amplitude: [1, 0.7, -1.3],
  mean: [19.1, 19.3, 19.4],
  jitter: [0, 0.02, 0.005],
  lag: lags ? [0, 4.3, -11.7] : [0, 0, 0],
});

describe("multi-band process against dense linear algebra", () => {
  for (const lags of [false, true])
    for (const [name, kernel] of families) {
      it(`${name}${lags ? " with lags" : ""}: log-likelihood, gradient, predictions agree to 1e-9`, () => {
        const bands = threeBands(`joint:${name}`);
        const p = parameters(lags);
        const joint = new MultiBandProcess(
          kernel,
          bands.map((b, k) => ({ name: "gri"[k], time: b.time, values: b.values, errors: b.errors })),
          p,
        );
        const dense = denseMultiBand(kernel, bands, p);
        const logL = joint.logLikelihood();
        expect(Math.abs(logL - dense.value) / Math.abs(dense.value)).toBeLessThan(1e-9);

        const g = joint.logLikelihoodGradient();
        const gd = dense.gradient();
        expect(Math.abs(g.value - dense.value) / Math.abs(dense.value)).toBeLessThan(1e-9);
        const scale = Math.max(1, ...Array.from(gd.kernel, Math.abs));
        for (let c = 0; c < gd.kernel.length; c++) expect(Math.abs(g.kernel[c] - gd.kernel[c]) / scale).toBeLessThan(1e-9);
        for (const key of ["amplitude", "mean", "jitter"] as const) {
          const bandScale = Math.max(1, ...Array.from(gd[key], Math.abs));
          for (let b = 0; b < 3; b++) expect(Math.abs(g[key][b] - gd[key][b]) / bandScale).toBeLessThan(1e-9);
        }
        // The lag derivatives are Richardson-extrapolated central differences of the exact likelihood (the
        // engine has no adjoint of the times), limited by rounding to about eps |log L| / h ~ 1e-9 of the
        // gradient; the dense reference differentiates the kernel instead. Hence 1e-8 here.
        const lagScale = Math.max(1, ...Array.from(gd.lag, Math.abs));
        for (let b = 0; b < 3; b++) expect(Math.abs(g.lag[b] - gd.lag[b]) / lagScale).toBeLessThan(1e-8);

        const targets = Float64Array.from([-150, -3, bands[1].time[5] + 0.1, 250, 300, bands[0].time[30], 640, 800, 1200]);
        const given = joint.given();
        for (let b = 0; b < 3; b++) {
          const ps = given.at(b, targets);
          const pd = dense.predict(b, targets);
          expect(maxRelativeDifference(ps.mean, pd.mean)).toBeLessThan(1e-9);
          expect(maxRelativeDifference(ps.variance, pd.variance, kernel.variance * 1e-3)).toBeLessThan(1e-9);
        }

        // The band means integrated out (Woodbury identity) against the dense marginal covariance.
        const priors = [{ mean: 19, sd: 0.5 }, { mean: 19.5, sd: 2 }, { mean: 19.2, sd: 0.1 }];
        const marginal = joint.meanMarginal(priors);
        const dm = denseMeanMarginal(kernel, bands, p, priors);
        expect(Math.abs(marginal.logLikelihood - dm.logLikelihood) / Math.abs(dm.logLikelihood)).toBeLessThan(1e-9);
        expect(maxRelativeDifference(marginal.mean, dm.mean)).toBeLessThan(1e-9);
      });
    }

  it("one band with unit amplitude is the single-band likelihood", () => {
    const rng = createRng("joint:single");
    const time = seasonalTimes(rng, { seasons: 2, perSeason: 30 });
    const errors = randomErrors(rng, time.length);
    const values = Float64Array.from(time, () => rng.normal());
    const kernel = kernels.dampedRandomWalk({ sigma: 0.5, tau: 50 });
    const joint = new MultiBandProcess(kernel, [{ name: "g", time, values, errors }], { amplitude: [1], mean: [0.1], jitter: [0.03] });
    const dense = denseMultiBand(kernel, [{ time, errors, values }], { amplitude: [1], mean: [0.1], jitter: [0.03], lag: [0] });
    expect(Math.abs(joint.logLikelihood() - dense.value)).toBeLessThan(1e-9 * Math.abs(dense.value));
  });

  it("is continuous in a lag where shifted times cross", () => {
    // Band r has a point exactly 2 days after one of band g: at lag 2 the two shifted times coincide and
    // their joint order swaps. Continuity is checked on both sides (a jump would show as a gap >> step).
    const time = [Float64Array.of(0, 10, 20, 30), Float64Array.of(5, 12, 25)];
    const errors = [0.05, 0.05];
    const values = [Float64Array.of(0.1, -0.2, 0.3, 0.0), Float64Array.of(0.2, -0.1, 0.25)];
    const kernel = kernels.matern32({ sigma: 0.3, scale: 8 });
    const at = (lag: number) =>
      new MultiBandProcess(kernel, time.map((t, b) => ({ name: `b${b}`, time: t, values: values[b], errors: errors[b] })), {
        amplitude: [1, 1],
        mean: [0, 0],
        lag: [0, lag],
      }).logLikelihood();
    const left = at(2 - 1e-9);
    const right = at(2 + 1e-9);
    expect(Math.abs(left - right)).toBeLessThan(1e-7);
    expect(Math.abs(at(2) - left)).toBeLessThan(1e-7);
  });

  it("merges shifted bands in time order, ties to the band listed first", () => {
    const columns = bandColumns([Float64Array.of(0, 2, 4), Float64Array.of(1, 3)], Float64Array.of(1, 2, 3, 4, 5), Float64Array.of(10, 20, 30, 40, 50));
    const merge = mergeBands(columns, [0, 1]);
    expect(Array.from(merge.time)).toEqual([0, 0, 2, 2, 4]);
    expect(Array.from(merge.band)).toEqual([0, 1, 0, 1, 0]);
    expect(Array.from(merge.source)).toEqual([0, 3, 1, 4, 2]);
    expect(Array.from(merge.unshifted)).toEqual([0, 1, 2, 3, 4]);
    expect(Array.from(merge.errorVariance)).toEqual([1, 4, 2, 5, 3]);
    expect(Array.from(merge.values)).toEqual([10, 40, 20, 50, 30]);
  });

  it("repairs its joint order in place as the lags move: the same order and likelihood as a new merge", () => {
    // Reference: mergeBands from scratch (checked above) and a process built afresh for each lag vector.
    const bands = threeBands("joint:reshift").map((b, k) => ({ name: "gri"[k], time: b.time, values: b.values, errors: b.errors }));
    const kernel = kernels.dampedRandomWalk({ sigma: 0.3, tau: 80 });
    const base = new MultiBandProcess(kernel, bands, parameters(false));
    // Small steps (a few points swap), a jump of months (a new merge), back to zero, a tie with band 0.
    const tie = bands[0].time[10] - bands[1].time[3];
    for (const lag of [[0, 0.3, -0.2], [0, 0.9, -0.7], [0, 2.5, 1.1], [0, 120, -95], [0, 0, 0], [0, -tie, 0]]) {
      const p = { ...parameters(false), lag };
      const repaired = base.withParameters(kernel, p);
      const fresh = new MultiBandProcess(kernel, bands, p);
      expect(repaired.logLikelihood()).toBe(fresh.logLikelihood());
      expect(repaired.logLikelihoodGradient({ lags: false }).value).toBe(fresh.logLikelihoodGradient({ lags: false }).value);
    }
    // The repair itself: in place, the merge's order, with every carried array moved along.
    const flatValues = Float64Array.from(bands.flatMap((b) => Array.from(b.values)));
    const columns = bandColumns(bands.map((b) => b.time), Float64Array.from(flatValues, (_, s) => s + 0.5), flatValues);
    const start = mergeBands(columns, [0, 0, 0]);
    for (const lag of [[0, 0.4, -0.3], [0, -tie, 0], [0, 3, 2]]) {
      expect(reshiftMerge(start, lag, 1e9)).toBe(true);
      const fresh = mergeBands(columns, lag);
      for (const key of ["time", "band", "source", "unshifted", "errorVariance", "values"] as const)
        expect(Array.from(start[key]), key).toEqual(Array.from(fresh[key]));
    }
    expect(reshiftMerge(start, [0, 300, -300], 10)).toBe(false); // too many moves
    const permuted = Array.from(start.source).sort((a, b) => a - b);
    expect(permuted).toEqual(Array.from(permuted, (_, s) => s)); // a permutation is left behind
  });

  it("expects insertion moves in proportion to the relative lag change and both bands' densities", () => {
    // n_b n_c |d_b - d_c| / span: bands of 100 and 50 points over 200 d, band 1 moved 2 d against band 0.
    const offsets = Int32Array.of(0, 100, 150);
    expect(expectedMoves(offsets, [0, 0], [0, 2], 200)).toBeCloseTo((100 * 50 * 2) / 200, 12);
    expect(expectedMoves(offsets, [0, 0], [3, 3], 200)).toBe(0); // the same shift for every band moves nothing
  });

  it("rejects bad band parameters with a message naming them", () => {
    const bands = [{ name: "g", time: [0, 1, 2], values: [0, 0, 0] }];
    const kernel = kernels.dampedRandomWalk({ sigma: 1, tau: 1 });
    expect(() => new MultiBandProcess(kernel, bands, { amplitude: [0], mean: [0] })).toThrow(/amplitude\[0\]/);
    expect(() => new MultiBandProcess(kernel, bands, { amplitude: [1], mean: [0], jitter: [-1] })).toThrow(/jitter\[0\]/);
    expect(() => new MultiBandProcess(kernel, [{ name: "g", time: [0, 2, 1], values: [0, 0, 0] }], { amplitude: [1], mean: [0] })).toThrow(/sorted/);
  });
});
