import dmediansorted from "@stdlib/stats/strided/dmediansorted";
import { describe, expect, it } from "vitest";
import { ChainTraceRecorder, MAX_TRACE_STEPS } from "../../src/inference/chain-trace.js";
import { countEvaluations } from "../../src/inference/evaluation-counter.js";
import { createNutsSampler } from "../../src/inference/nuts-sampler.js";
import { createParameterSpace } from "../../src/inference/parameter-space.js";
import { logUniformPrior, normalPrior } from "../../src/inference/priors.js";
import { runSampler } from "../../src/inference/run-sampler.js";
import { createWalkerEnsemble } from "../../src/inference/walker-ensemble.js";
import { createRng } from "../../src/random/rng.js";
import { correlatedGaussian } from "./helpers/known-targets.js";

function ensembleOn5dGaussian(walkers: number, seed: number) {
  const counted = countEvaluations(correlatedGaussian().density);
  const rng = createRng(seed);
  const initial = Array.from({ length: walkers }, () => Float64Array.from({ length: 5 }, () => 5 + 0.1 * rng.normal()));
  return { sampler: createWalkerEnsemble(counted, initial, rng), counts: counted.counts };
}

describe("ChainTraceRecorder: a bounded trace of a whole run", () => {
  it("keeps between half the capacity and the capacity of evenly spaced steps from 0, for any run length", () => {
    for (const length of [1, 7, 64, 65, 1000, 12345]) {
      const recorder = new ChainTraceRecorder(3, 1, 64);
      for (let i = 0; i <= length; i++) if (recorder.wants(i)) recorder.record(i, { positions: [[i], [2 * i], [3 * i]].map((x) => Float64Array.from(x)), logPosterior: [0, 0, 0] });
      const space = createParameterSpace([{ name: "x", prior: normalPrior(0, 1e9) }]);
      const trace = recorder.finish(space, { sampler: "nuts", iterations: length, warmup: 0 });
      const steps = [...trace.steps];
      expect(steps[0]).toBe(0);
      expect(steps.length).toBeLessThanOrEqual(64);
      if (length >= 64) expect(steps.length).toBeGreaterThanOrEqual(32);
      const stride = steps.length > 1 ? steps[1] - steps[0] : 1;
      steps.forEach((s, k) => expect(s).toBe(k * stride));
      // The last step lies within one stride of the end: the trace covers the whole run.
      expect(length - steps[steps.length - 1]).toBeLessThan(stride);
      // Each step holds the state recorded at that iteration.
      expect(Array.from(trace.series[2].values.x)).toEqual(steps.map((s) => 3 * s));
    }
  });

  it("traces a few walkers exactly as the sampler kept them and the median over all walkers (stdlib dmediansorted)", () => {
    const walkers = 20;
    const { sampler, counts } = ensembleOn5dGaussian(walkers, 3);
    const run = runSampler(sampler, counts, { maxIterations: 1500, minIterations: 1e9 });
    const names = ["a", "b", "c", "d", "e"];
    const space = createParameterSpace(names.map((name) => ({ name, prior: normalPrior(0, 100) })));
    const trace = run.trace.finish(space, { sampler: "ensemble", iterations: run.diagnostics.iterations, warmup: run.warmup });
    expect(trace.steps.length).toBeGreaterThanOrEqual(MAX_TRACE_STEPS / 2);
    expect(trace.steps.length).toBeLessThanOrEqual(MAX_TRACE_STEPS);
    expect(trace.warmup).toBe(750);
    expect(trace.series.map((s) => s.label)).toEqual(["walker 1", "walker 6", "walker 11", "walker 16", "median of 20 walkers"]);
    // The ensemble keeps every iteration, so row i - 1 of its store is the state after iteration i.
    const store = sampler.draws;
    trace.series.slice(0, 4).forEach((series) => {
      const chain = series.chain ?? -1;
      trace.steps.forEach((step, k) => {
        if (step === 0) return;
        expect(series.values.c[k]).toBe(store.row(chain, step - 1)[2]);
        expect(series.logPosterior[k]).toBe(store.logPosteriorOf(chain, step - 1, step)[0]);
      });
    });
    const median = trace.series[4];
    trace.steps.forEach((step, k) => {
      if (step === 0) return;
      const values = Float64Array.from({ length: walkers }, (_, c) => store.row(c, step - 1)[4]).sort();
      expect(median.values.e[k]).toBeCloseTo(dmediansorted(walkers, values, 1), 12);
    });
    // The start at (5, ..., 5) is far in the tail of the target: the trace shows the walkers coming in.
    expect(median.values.a[0]).toBeCloseTo(5, 0);
    expect(Math.abs(median.values.a[trace.steps.length - 1])).toBeLessThan(3);
  });

  it("records NUTS warm-up too, and maps the trace to physical units", () => {
    const target = countEvaluations(correlatedGaussian().density);
    const rng = createRng(4);
    const initial = Array.from({ length: 2 }, () => Float64Array.from({ length: 5 }, () => rng.normal()));
    const sampler = createNutsSampler(target, initial, 4, { warmup: 100 });
    const run = runSampler(sampler, target.counts, { maxIterations: 300, minIterations: 1e9 });
    expect(run.warmup).toBe(100);
    // A bounded prior samples a transform of x: the trace is in x itself.
    const space = createParameterSpace([
      { name: "x", prior: logUniformPrior(1e-3, 1e3) },
      ...["b", "c", "d", "e"].map((name) => ({ name, prior: normalPrior(0, 100) })),
    ]);
    const trace = run.trace.finish(space, { sampler: "nuts", iterations: 300, warmup: run.warmup });
    expect(trace.steps.length).toBe(301);
    expect(trace.series.map((s) => s.label)).toEqual(["chain 1", "chain 2"]);
    const last = trace.steps.length - 1;
    expect(trace.steps[last]).toBe(300);
    const kept = sampler.draws.row(1, 300 - 100 - 1);
    expect(trace.series[1].values.x[last]).toBe(space.toPhysical(kept)[0]);
    expect(trace.series[1].values.x[last]).toBeGreaterThan(1e-3);
    expect(trace.series[1].values.x[last]).toBeLessThan(1e3);
  });
});
