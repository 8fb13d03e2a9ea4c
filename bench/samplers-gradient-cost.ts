/**
 * Measures what a log-likelihood gradient costs in log-likelihood evaluations, for the models of the
 * sampler benchmark, through the same adapters the samplers use (a Gaussian process is built per call).
 * Value and gradient calls alternate in short blocks and the ratio is the median over blocks, so a
 * shared, busy machine biases neither side. The inference layer's DEFAULT_GRADIENT_COST comes from here.
 *
 * Run: npx tsx bench/samplers-gradient-cost.ts [blocks]
 */
import { dampedRandomWalkFit, quasiPeriodicFit, type SimulatedFit } from "./samplers-gp-models.js";

function median(values: number[]): number {
  const s = values.slice().sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

function measure(fit: SimulatedFit, blocks: number): { value: number; gradient: number; ratio: number } {
  const x = fit.space.physicalFromRecord(fit.truth);
  const g = new Float64Array(x.length);
  const like = fit.likelihood;
  const gradientFn = like.logLikelihoodAndGradient!;
  // Enough calls per block for a few milliseconds of work.
  const perBlock = Math.max(5, Math.round(20000 / fit.time.length));
  let sink = 0;
  for (let k = 0; k < 3 * perBlock; k++) sink += like.logLikelihood(x) + gradientFn(x, g);
  const valueTimes: number[] = [];
  const gradientTimes: number[] = [];
  const ratios: number[] = [];
  for (let b = 0; b < blocks; b++) {
    let t0 = performance.now();
    for (let k = 0; k < perBlock; k++) sink += like.logLikelihood(x);
    const tv = (performance.now() - t0) / perBlock;
    t0 = performance.now();
    for (let k = 0; k < perBlock; k++) sink += gradientFn(x, g);
    const tg = (performance.now() - t0) / perBlock;
    valueTimes.push(tv);
    gradientTimes.push(tg);
    ratios.push(tg / tv);
  }
  if (!Number.isFinite(sink)) throw new Error("non-finite likelihood in the benchmark");
  return { value: median(valueTimes), gradient: median(gradientTimes), ratio: median(ratios) };
}

const blocks = Number(process.argv[2] ?? 40);
console.log("model                          value (ms)  value+gradient (ms)  gradient cost (value evaluations)");
for (const fit of [dampedRandomWalkFit(250), quasiPeriodicFit(1000)]) {
  const r = measure(fit, blocks);
  console.log(
    `${fit.label.padEnd(30)} ${r.value.toFixed(4).padStart(10)}  ${r.gradient.toFixed(4).padStart(19)}  ${r.ratio.toFixed(2).padStart(10)}`,
  );
}
