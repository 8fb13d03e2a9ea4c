import { describe, expect, it } from "vitest";
import { createRng } from "../../src/random/rng.js";
import { effectiveSampleSize } from "../../src/inference/effective-sample-size.js";
import { countEvaluations } from "../../src/inference/evaluation-counter.js";
import { createNutsSampler } from "../../src/inference/nuts-sampler.js";
import { runSampler, type SamplerRun } from "../../src/inference/run-sampler.js";
import { sortedCopy, sortedQuantile } from "../../src/numerics/order-statistics.js";
import { pooledChains as pooled } from "../../src/numerics/pooled-chains.js";
import { createWalkerEnsemble, defaultWalkerCount } from "../../src/inference/walker-ensemble.js";
import { banana, correlatedGaussian, twoModeMixture, type KnownTarget } from "./helpers/known-targets.js";

const PROBABILITIES = [0.025, 0.16, 0.5, 0.84, 0.975];

/** Runs one sampler to convergence on a target from starting points drawn around `centre` with sd `spread`. */
function sample(target: KnownTarget, kind: "ensemble" | "nuts", seed: number, spread: number): SamplerRun {
  const counted = countEvaluations(target.density);
  const d = target.density.dimension;
  const rng = createRng(seed);
  const count = kind === "ensemble" ? defaultWalkerCount(d) : 4;
  const initial = Array.from({ length: count }, () => Float64Array.from({ length: d }, () => spread * rng.normal()));
  const sampler =
    kind === "ensemble" ? createWalkerEnsemble(counted, initial, rng) : createNutsSampler(counted, initial, seed);
  // Checks every 50% growth: these targets are cheap, so the convergence checks would dominate the time.
  return runSampler(sampler, counted.counts, { maxEvaluations: 3e6, checkGrowth: 1.5 });
}

/**
 * Checks every exact marginal quantile against the estimate, within 4 Monte-Carlo standard errors:
 * se(q_p) = sqrt(p (1 - p) / ESS_p) / f(q_p), the asymptotic sd of a sample quantile (Serfling 1980,
 * Approximation Theorems of Mathematical Statistics, sec. 2.3) with the effective sample size of the
 * indicator I(x <= q_p) in place of the number of draws (Vehtari et al. 2021, sec. 4.3). Four, not two,
 * because about 60 quantiles are checked per sampler.
 */
function expectQuantiles(target: KnownTarget, run: SamplerRun): void {
  const store = run.sampler.draws;
  for (let i = 0; i < target.density.dimension; i++) {
    const chains = store.coordinate(i, run.analysisStart);
    const sorted = sortedCopy(pooled(chains));
    for (const p of PROBABILITIES) {
      const exact = target.quantile(i, p);
      const indicator = chains.map((c) => Float64Array.from(c, (x) => (x <= exact ? 1 : 0)));
      const ess = effectiveSampleSize(indicator);
      const se = Math.sqrt((p * (1 - p)) / ess) / target.marginalDensity(i, exact);
      const estimate = sortedQuantile(sorted, p);
      expect(Math.abs(estimate - exact), `${target.name} x${i} q${p}: ${estimate} vs ${exact} (se ${se})`).toBeLessThan(4 * se);
    }
  }
}

describe.each(["ensemble", "nuts"] as const)("%s sampler on targets with exact quantiles", (kind) => {
  it("correlated 5-D Gaussian (walkers and chains start in a tight ball, as around a MAP)", () => {
    const target = correlatedGaussian();
    const run = sample(target, kind, 101, 0.05);
    expect(run.stopReason).toBe("converged");
    expectQuantiles(target, run);
  });

  it("banana", () => {
    const target = banana();
    const run = sample(target, kind, 202, 1);
    expect(run.stopReason).toBe("converged");
    expectQuantiles(target, run);
  });

  it("two-mode mixture (starts spread over both modes)", () => {
    const target = twoModeMixture();
    const run = sample(target, kind, 303, 2.5);
    expect(run.stopReason).toBe("converged");
    expectQuantiles(target, run);
  });
});
