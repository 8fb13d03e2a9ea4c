/**
 * Measures what a log-likelihood gradient costs in log-likelihood evaluations, on the sampler
 * benchmark's simulated light curves (bench/samplers-gp-models.ts), through three adapters:
 * - "model": `modelLikelihood` of src/models, what NUTS and L-BFGS call in a fit (inputs checked once,
 *   `withKernel` per call, the gradient tape reused);
 * - "mean integrated out": the same model with the constant mean integrated out (`collapseMean`), what
 *   the optimiser and importance sampling or the ensemble of a fit call;
 * - "new process per call": the benchmark's own adapter, which builds a GaussianProcess per call (inputs
 *   copied and checked, a fresh tape each time).
 * Value and gradient calls alternate in short blocks timed by the process's CPU time (process.cpuUsage,
 * which does not count the time other processes hold the core), and the ratio is the median over blocks,
 * so a shared, busy machine biases neither side. The inference layer's DEFAULT_GRADIENT_COST comes from the
 * first two.
 *
 * Run: npx tsx bench/samplers-gradient-cost.ts [blocks]
 */
import { loadavg } from "node:os";
import type { PhysicalLikelihood } from "../src/inference/unconstrained-posterior.js";
import { summarizeLightCurve } from "../src/models/data-summary.js";
import { buildModel, modelLikelihood } from "../src/models/light-curve-model.js";
import { collapseMean } from "../src/models/mean-marginal.js";
import { adapterCases } from "./samplers-gp-models.js";

function median(values: number[]): number {
  const s = values.slice().sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Milliseconds of CPU time this process has used. */
function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

function measure(like: PhysicalLikelihood, x: Float64Array, n: number, blocks: number): { value: number; gradient: number; ratio: number } {
  const g = new Float64Array(x.length);
  const gradientFn = like.logLikelihoodAndGradient!;
  // Enough calls per block for about ten milliseconds of work.
  const perBlock = Math.max(20, Math.round(200000 / n));
  let sink = 0;
  for (let k = 0; k < 3 * perBlock; k++) sink += like.logLikelihood(x) + gradientFn(x, g);
  const valueTimes: number[] = [];
  const gradientTimes: number[] = [];
  const ratios: number[] = [];
  for (let b = 0; b < blocks; b++) {
    let t0 = cpuMs();
    for (let k = 0; k < perBlock; k++) sink += like.logLikelihood(x);
    const tv = (cpuMs() - t0) / perBlock;
    t0 = cpuMs();
    for (let k = 0; k < perBlock; k++) sink += gradientFn(x, g);
    const tg = (cpuMs() - t0) / perBlock;
    valueTimes.push(tv);
    gradientTimes.push(tg);
    ratios.push(tg / tv);
  }
  if (!Number.isFinite(sink)) throw new Error("non-finite likelihood in the benchmark");
  return { value: median(valueTimes), gradient: median(gradientTimes), ratio: median(ratios) };
}

const blocks = Number(process.argv[2] ?? 40);
console.log(`load average at start: ${loadavg().map((v) => v.toFixed(2)).join(" ")}`);
console.log("| model | adapter | value (CPU ms) | value + gradient (CPU ms) | gradient cost (value evaluations) |");
console.log("| --- | --- | --- | --- | --- |");
for (const { fit, model: name, lightCurve } of adapterCases()) {
  const model = buildModel(name, summarizeLightCurve(lightCurve));
  const collapsed = collapseMean(model, lightCurve)!;
  const truth = fit.space.physicalFromRecord(fit.truth);
  const modelX = model.space.physicalFromRecord(Object.fromEntries(model.space.names.map((n) => [n, fit.truth[n] ?? model.initialGuess[n]!])));
  const collapsedX = collapsed.space.physicalFromRecord(Object.fromEntries(collapsed.space.names.map((n) => [n, fit.truth[n] ?? model.initialGuess[n]!])));
  const adapters: Array<[string, PhysicalLikelihood, Float64Array]> = [
    ["model", modelLikelihood(model, lightCurve), modelX],
    ["mean integrated out", collapsed.likelihood, collapsedX],
    ["new process per call", fit.likelihood, truth],
  ];
  for (const [adapter, like, x] of adapters) {
    if (!like.logLikelihoodAndGradient) continue;
    const r = measure(like, x, fit.time.length, blocks);
    console.log(`| ${fit.label} | ${adapter} | ${r.value.toFixed(4)} | ${r.gradient.toFixed(4)} | ${r.ratio.toFixed(2)} |`);
  }
}
console.log(`load average at end: ${loadavg().map((v) => v.toFixed(2)).join(" ")}`);
