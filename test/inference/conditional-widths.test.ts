import laplaceLogPdf from "@stdlib/stats/base/dists/laplace/logpdf";
import laplacePdf from "@stdlib/stats/base/dists/laplace/pdf";
import laplaceQuantile from "@stdlib/stats/base/dists/laplace/quantile";
import laplaceStdev from "@stdlib/stats/base/dists/laplace/stdev";
import { describe, expect, it } from "vitest";
import { conditionalWidths } from "../../src/inference/conditional-widths.js";
import { importanceSample } from "../../src/inference/importance-sampling.js";
import { modeCovariance } from "../../src/inference/mode-covariance.js";
import type { PosteriorTarget } from "../../src/inference/posterior-target.js";
import { createRng } from "../../src/random/rng.js";
import { weightedQuantile } from "./helpers/weighted-quantile.js";

// A likelihood with a kink at its mode, as a damped random walk's has in a lag wherever a band's shifted
// time crosses another band's (docs/multi-band.md, "How a joint fit samples"): independent Laplace
// (double-exponential) coordinates, ln p = sum_i ln Laplace(x_i; mu_i, b_i), tent-shaped in every
// coordinate. Their sd sqrt(2) b_i, quantiles and densities from @stdlib's Laplace distribution.
const DIMENSION = 12;
const location = Float64Array.from({ length: DIMENSION }, (_, i) => 0.5 * i - 2);
const scale = Float64Array.from({ length: DIMENSION }, (_, i) => 0.05 * (1 + (i % 4)));
const tents: PosteriorTarget = {
  dimension: DIMENSION,
  logPosterior: (x) => {
    let sum = 0;
    for (let i = 0; i < DIMENSION; i++) sum += laplaceLogPdf(x[i], location[i], scale[i]);
    return sum;
  },
};

describe("conditional widths where the log density has a kink at the mode", () => {
  it("the curvature at the tip says far too narrow; the grid finds the Laplace sd sqrt(2) b within 5%", () => {
    const laplace = modeCovariance(tents, location);
    expect(laplace).toBeDefined();
    const laplaceSd = Array.from({ length: DIMENSION }, (_, i) => Math.sqrt(laplace?.[i * DIMENSION + i] ?? NaN));
    laplaceSd.forEach((s, i) => expect(s).toBeLessThan(0.3 * laplaceStdev(location[i], scale[i])));
    const widths = conditionalWidths(tents, location, laplaceSd);
    for (let i = 0; i < DIMENSION; i++) {
      expect(Math.abs(widths.sd[i] / laplaceStdev(location[i], scale[i]) - 1)).toBeLessThan(0.05);
      expect(Math.abs(widths.mean[i] - location[i])).toBeLessThan(0.05 * scale[i]);
    }
    expect(widths.evaluations).toBeLessThanOrEqual(1 + 2 * 19 * DIMENSION);
  });

  it("importance sampling in 12 dimensions fails from the Laplace proposal and holds from the widened one, quantiles within 4 se", () => {
    const mode = Float64Array.from(location);
    const plain = importanceSample(tents, mode, createRng("tents"), { refitInflation: 1.44 });
    expect(plain.accepted).toBe(false);
    const widened = importanceSample(tents, mode, createRng("tents"), { conditionalWidening: "shift", refitInflation: 1.44 });
    expect(widened.accepted).toBe(true);
    for (let i = 0; i < DIMENSION; i++) {
      for (const p of [0.025, 0.16, 0.5, 0.84, 0.975]) {
        const q = laplaceQuantile(p, location[i], scale[i]);
        // The asymptotic sd of a sample quantile (Serfling 1980, sec. 2.3), the weights' ESS as the sample size.
        const se = Math.sqrt((p * (1 - p)) / widened.effectiveSampleSize) / laplacePdf(q, location[i], scale[i]);
        expect(Math.abs(weightedQuantile(widened, i, p) - q)).toBeLessThan(4 * se);
      }
    }
  });
});
