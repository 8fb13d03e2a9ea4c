import { describe, expect, it } from "vitest";
import { createRng } from "../../src/random/rng.js";
import { countEvaluations } from "../../src/inference/evaluation-counter.js";
import { createNutsSampler } from "../../src/inference/nuts-sampler.js";
import { runSampler, type SamplerProgress } from "../../src/inference/run-sampler.js";
import { createWalkerEnsemble } from "../../src/inference/walker-ensemble.js";
import { correlatedGaussian } from "./helpers/known-targets.js";

function makeSampler(kind: "ensemble" | "nuts", seed: number) {
  const counted = countEvaluations(correlatedGaussian().density);
  const rng = createRng(seed);
  const count = kind === "ensemble" ? 20 : 3;
  const initial = Array.from({ length: count }, () => Float64Array.from({ length: 5 }, () => rng.normal()));
  const sampler = kind === "ensemble" ? createWalkerEnsemble(counted, initial, rng) : createNutsSampler(counted, initial, seed, { warmup: 100 });
  return { sampler, counts: counted.counts };
}

describe.each(["ensemble", "nuts"] as const)("%s run control", (kind) => {
  it("same seed, same draws, bit for bit; another seed, other draws", () => {
    const draws = (seed: number): Float64Array[] => {
      const { sampler, counts } = makeSampler(kind, seed);
      runSampler(sampler, counts, { maxIterations: 250 });
      return sampler.draws.coordinate(2);
    };
    const a = draws(5);
    const b = draws(5);
    const c = draws(6);
    expect(a.length).toBeGreaterThan(0);
    a.forEach((chain, i) => expect(Buffer.from(chain.buffer).equals(Buffer.from(b[i].buffer))).toBe(true));
    expect(Buffer.from(a[0].buffer).equals(Buffer.from(c[0].buffer))).toBe(false);
  });

  it("stops on the evaluation budget and says so", () => {
    const { sampler, counts } = makeSampler(kind, 1);
    // Evaluations made while setting the sampler up (initial points, step-size search) are not the run's.
    const before = { ...counts };
    const run = runSampler(sampler, counts, { maxEvaluations: 3000, gradientCost: 2 });
    expect(run.stopReason).toBe("budget");
    expect(run.diagnostics.converged).toBe(false);
    // The budget is checked before each iteration, so it is exceeded by at most one iteration.
    expect(run.diagnostics.likelihoodEvaluations).toBeGreaterThanOrEqual(3000);
    expect(run.diagnostics.likelihoodEvaluations).toBe(counts.values - before.values + 2 * (counts.gradients - before.gradients));
  });

  it("reports monotone progress and stops when cancelled", () => {
    const { sampler, counts } = makeSampler(kind, 2);
    const seen: SamplerProgress[] = [];
    const signal = { aborted: false };
    const run = runSampler(sampler, counts, {
      maxIterations: 100000,
      progressInterval: 5,
      signal,
      onProgress: (p) => {
        seen.push(p);
        if (p.iteration >= 150) signal.aborted = true;
      },
    });
    expect(run.stopReason).toBe("cancelled");
    expect(run.sampler.iterations).toBeLessThanOrEqual(155);
    expect(seen.length).toBeGreaterThan(10);
    for (let k = 1; k < seen.length; k++) expect(seen[k].fraction).toBeGreaterThanOrEqual(seen[k - 1].fraction);
    expect(seen.at(-1)!.fraction).toBeLessThan(1);
  });
});
