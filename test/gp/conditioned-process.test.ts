import { describe, expect, it } from "vitest";
import { DenseGaussianProcess } from "../../src/gp/dense-gaussian-process.js";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { MAX_COVARIANCE_SIZE, type ConditionedProcess } from "../../src/gp/process-interface.js";
import { kernels, type Kernel } from "../../src/kernels/index.js";
import { semiseparablePredict } from "../../src/linalg/semiseparable-smoother.js";
import { createRng } from "../../src/random/rng.js";
import { expectSameConditioning } from "../helpers/conditioned-agreement.js";
import { maxRelativeDifference, randomErrors, seasonalTimes } from "../helpers/seasonal-times.js";

// Reference: DenseGaussianProcess, the dense Cholesky of ml-matrix (a general-purpose linear-algebra
// library) with the prediction equations of Rasmussen & Williams 2006, Algorithm 2.1 and eq. 2.24.
const families: Array<[string, Kernel]> = [
  ["damped random walk", kernels.dampedRandomWalk({ sigma: 0.3, tau: 120 })],
  ["oscillator", kernels.oscillator({ sigma: 0.2, period: 37, quality: 6 })],
  ["matern32", kernels.matern32({ sigma: 0.15, scale: 15 })],
  ["oscillator plus damped random walk", kernels.oscillator({ sigma: 0.1, period: 23.4, quality: 2 }).plus(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }))],
  ["oscillator times damped random walk", kernels.oscillator({ sigma: 0.5, period: 40, quality: 3 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 200 }))],
];

function observed(kernel: Kernel, seed: string) {
  const rng = createRng(seed);
  const time = seasonalTimes(rng, { seasons: 3, perSeason: 50 });
  const errors = randomErrors(rng, time.length);
  const options = { errors, mean: 0.4, jitter: 0.01 };
  const sparse = new GaussianProcess(kernel, time, options);
  const values = sparse.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
  return { time, errors, sparse, dense: new DenseGaussianProcess(kernel, time, options), values };
}

/** Requested times in no order: before the data, in a gap, on data times (ties), between points, after. */
function requested(time: Float64Array): Float64Array {
  return Float64Array.from([800, -150, time[7], 250, time[0], time[7] + 1e-3, 1500, time[time.length - 1], 300, -3, 640]);
}

describe("given(values): the conditioned process against the dense engine", () => {
  for (const [name, kernel] of families) {
    it(`${name}: at (first and later queries) and covarianceAt agree to 1e-9`, () => {
      const { time, sparse, dense, values } = observed(kernel, `given:${name}`);
      const times = requested(time);
      const { givenEngine: givenSparse, prediction: a, expected: b, covariance } = expectSameConditioning(sparse, dense, values, times, kernel.variance);
      const m = times.length;
      for (let i = 0; i < m; i++) {
        expect(Math.abs(covariance[i * m + i] - a.variance[i])).toBeLessThan(1e-9 * kernel.variance);
        for (let j = 0; j < m; j++) expect(covariance[i * m + j]).toBe(covariance[j * m + i]);
      }
      // The second and later queries come from the kept states: the same agreement, and one time at a
      // time gives the same numbers as all at once.
      const again = givenSparse.at(times);
      expect(maxRelativeDifference(again.mean, b.mean)).toBeLessThan(1e-9);
      expect(maxRelativeDifference(again.variance, b.variance, kernel.variance * 1e-3)).toBeLessThan(1e-9);
      const single = Float64Array.from(times, (t) => givenSparse.at([t]).mean[0]);
      expect(Array.from(single)).toEqual(Array.from(givenSparse.at(times).mean));
    });
  }

  it("the kept states agree with the smoother over data and requested times together (1e-12)", () => {
    const kernel = families[4][1];
    const { time, errors, sparse, values } = observed(kernel, "given:merged");
    const sorted = requested(time).sort();
    const given = sparse.given(values);
    given.at(sorted.subarray(0, 1)); // the first query runs the merged pass; the states are kept from the second
    const kept = given.at(sorted);
    const noise = Float64Array.from(errors, (e) => e * e + 0.01 * 0.01);
    const merged = semiseparablePredict(kernel.semiseparableForm()!, time, noise, values.map((v) => v - 0.4), sorted);
    for (let k = 0; k < sorted.length; k++) {
      expect(Math.abs(kept.mean[k] - 0.4 - merged.mean[k])).toBeLessThan(1e-12 * Math.max(1, Math.abs(kept.mean[k])));
      expect(Math.abs(kept.variance[k] - merged.variance[k])).toBeLessThan(1e-12 * kernel.variance);
    }
  });

  it("refuses a joint covariance above the size limit, and non-finite requested times", () => {
    const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 1, tau: 10 }), [0, 1, 2], { errors: 0.1 });
    const given = gp.given([0.1, 0.2, 0.3]);
    const tooMany = new Float64Array(MAX_COVARIANCE_SIZE + 1);
    expect(() => given.covarianceAt(tooMany)).toThrow(RangeError);
    expect(() => given.covarianceAt(tooMany)).toThrow(new RegExp(`limited to ${MAX_COVARIANCE_SIZE} times.*got ${MAX_COVARIANCE_SIZE + 1}`));
    expect(() => given.at([1, NaN])).toThrow(/at: requested times\[1\] is not finite/);
    expect(() => given.draw(createRng(1), [Infinity])).toThrow(/draw: requested times\[0\] is not finite/);
    expect(() => gp.given([0.1, 0.2])).toThrow(/2 values for 3 times/);
  });
});

/**
 * Draws at `times` against the mean and covariance they should have: the sample mean within 4.5 standard
 * errors and each sample covariance within 4.5 of its standard error sqrt((C_ii C_jj + C_ij^2) / n)
 * (Anderson 2003, An Introduction to Multivariate Statistical Analysis, 3rd ed., section 3.4).
 */
function expectDrawsFollow(draw: () => Float64Array, mean: Float64Array, covariance: Float64Array, n: number): void {
  const m = mean.length;
  const s1 = new Float64Array(m);
  const s2 = new Float64Array(m * m);
  for (let d = 0; d < n; d++) {
    const x = draw();
    for (let i = 0; i < m; i++) {
      s1[i] += x[i];
      for (let j = 0; j < m; j++) s2[i * m + j] += (x[i] - mean[i]) * (x[j] - mean[j]);
    }
  }
  let worstMean = 0;
  let worstCovariance = 0;
  for (let i = 0; i < m; i++) {
    worstMean = Math.max(worstMean, Math.abs(s1[i] / n - mean[i]) / Math.sqrt(covariance[i * m + i] / n));
    for (let j = 0; j < m; j++) {
      const c = covariance[i * m + j];
      const se = Math.sqrt((covariance[i * m + i] * covariance[j * m + j] + c * c) / n);
      worstCovariance = Math.max(worstCovariance, Math.abs(s2[i * m + j] / n - c) / se);
    }
  }
  // m = 6 means and 21 distinct covariances: 4.5 standard errors is exceeded with probability < 1e-3.
  expect(worstMean).toBeLessThan(4.5);
  expect(worstCovariance).toBeLessThan(4.5);
}

describe("draws (fixed seeds)", () => {
  const kernel = kernels.oscillator({ sigma: 0.3, period: 20, quality: 2 }).plus(kernels.dampedRandomWalk({ sigma: 0.1, tau: 50 }));
  const rng = createRng("conditioned-draws");
  const time = seasonalTimes(rng, { seasons: 2, perSeason: 25 });
  const errors = randomErrors(rng, time.length);
  const sparse = new GaussianProcess(kernel, time, { errors, mean: 2 });
  const dense = new DenseGaussianProcess(kernel, time, { errors, mean: 2 });
  const values = sparse.priorDraw(rng).map((v, i) => v + errors[i] * rng.normal());
  // In a gap, on a data time, between points, beyond both ends; unsorted.
  const times = Float64Array.from([250, -30, time[10], 100, 800, time[10] + 0.5]);
  const reference = dense.given(values);
  const { mean } = reference.at(times);
  const covariance = reference.covarianceAt(times);

  it.each<[string, ConditionedProcess]>([
    ["semiseparable (Matheron's rule)", sparse.given(values)],
    ["dense (Cholesky of the conditional covariance)", dense.given(values)],
  ])("%s: conditional draws have the dense engine's mean and joint covariance", (_, given) => {
    const drawRng = createRng(`draws:${_}`);
    expectDrawsFollow(() => given.draw(drawRng, times), mean, covariance, 4000);
  });

  it("prior draws of both engines have the kernel's covariance and the process's mean", () => {
    const m = time.length;
    const sub = [0, 3, 11, 24, 25, 49];
    const priorMean = new Float64Array(sub.length).fill(2);
    const priorCovariance = new Float64Array(sub.length * sub.length);
    for (let i = 0; i < sub.length; i++)
      for (let j = 0; j < sub.length; j++) priorCovariance[i * sub.length + j] = kernel.covarianceAt(time[sub[i]] - time[sub[j]]);
    for (const [label, gp] of [["sparse", sparse], ["dense", dense]] as const) {
      const priorRng = createRng(`prior:${label}`);
      expectDrawsFollow(() => {
        const x = gp.priorDraw(priorRng);
        expect(x.length).toBe(m);
        return Float64Array.from(sub, (i) => x[i]);
      }, priorMean, priorCovariance, 4000);
    }
  });

  it("the same seed gives the same conditional draw bit for bit", () => {
    const given = sparse.given(values);
    expect(Array.from(given.draw(createRng(5), times))).toEqual(Array.from(given.draw(createRng(5), times)));
  });
});
