/**
 * The joint multi-band likelihood's cost per point against the single-band one (issue 14 target: within
 * 1.3x). Both are timed as a sampler calls them: the single band through `GaussianProcess.withKernel`
 * (checked inputs reused) and `logLikelihood`, the joint one through `MultiBandProcess.withParameters` and
 * `logLikelihood` on the same N points split into six interleaved bands (without lags; with one band's
 * lag or every band's lag changing at every call, which repairs or re-merges the joint order). Rounds alternate the variants; the ratio is the
 * median of the per-round ratios. Prints Markdown.
 *
 *   npx tsx bench/multi-band-likelihood.ts [--rounds K] [--batch SECONDS]
 */
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { MultiBandProcess } from "../src/gp/multi-band-process.js";
import { kernels, type Kernel } from "../src/kernels/index.js";
import { createRng } from "../src/random/rng.js";
import { calibrateRepeat, formatSignificant, markdownTable, median, nanosecondsPerPoint, timeBatch } from "./engine-timing.js";
import { numberArgument } from "./command-line.js";

const BANDS = 6;

/** N epochs in seasons (200 d on, 165 d off), visited in turn by six bands. */
function invented(n: number) {
  const rng = createRng(`bench:multi-band:${n}`);
  const time = new Float64Array(n);
  let t = 0;
  for (let i = 0; i < n; i++) {
    t += -Math.log(1 - rng.uniform()) * (1000 / n) * 0.55;
    if (t % 365 > 200) t += 165;
    time[i] = t;
  }
  const errors = Float64Array.from(time, () => 0.02 + 0.04 * rng.uniform());
  const values = Float64Array.from(time, () => 19 + 0.2 * rng.normal());
  const bandTimes = Array.from({ length: BANDS }, (_, b) => time.filter((_, i) => i % BANDS === b));
  const bandErrors = Array.from({ length: BANDS }, (_, b) => errors.filter((_, i) => i % BANDS === b));
  const bandValues = Array.from({ length: BANDS }, (_, b) => values.filter((_, i) => i % BANDS === b));
  return { time, errors, values, bandTimes, bandErrors, bandValues };
}

function main(): void {
  const rounds = numberArgument("rounds", 7);
  const batchSeconds = numberArgument("batch", 0.3);
  const rows: string[][] = [];
  const sizesIndex = process.argv.indexOf("--sizes");
  const sizes = sizesIndex >= 0 ? (process.argv[sizesIndex + 1] ?? "").split(",").map(Number) : [360, 3600, 36000, 360000];
  for (const n of sizes) {
    const data = invented(n);
    const base = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 200 }), data.time, { errors: data.errors });
    const bands = data.bandTimes.map((time, b) => ({ name: `b${b}`, time, values: data.bandValues[b], errors: data.bandErrors[b] }));
    const amplitude = [1, 0.9, 0.8, 0.7, 0.6, 0.5];
    const mean = [19, 19, 19, 19, 19, 19];
    // One process per joint variant: processes made by `withParameters` share their bands' cached joint
    // order, so a variant with lags would leave the fixed-lag variant a new merge at every batch's start.
    const processOfBands = () => new MultiBandProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 200 }), bands, { amplitude, mean });
    const fixed = processOfBands();
    const moving = processOfBands();
    const everyBand = processOfBands();
    let call = 0;
    const kernelAt = (): Kernel => kernels.dampedRandomWalk({ sigma: 0.2, tau: 200 + (call++ % 7) });
    const single = () => base.withKernel(kernelAt(), { mean: 19 }).logLikelihood(data.values);
    const together = () => fixed.withParameters(kernelAt(), { amplitude, mean }).logLikelihood();
    // One band's lag stepping by 0.1 d; every band's lag stepping by 0.1-0.3 d (as a sampler moves them).
    const lagged = () => moving.withParameters(kernelAt(), { amplitude, mean, lag: [0, 1 + (call % 5) * 0.1, 2, 3, 4, 5] }).logLikelihood();
    const allLagged = () => {
      const c = call;
      const lag = [0, 1 + (c % 5) * 0.1, 2 + (c % 3) * 0.1, 3 - (c % 4) * 0.1, 4 + (c % 2) * 0.3, 5 - (c % 3) * 0.2];
      return everyBand.withParameters(kernelAt(), { amplitude, mean, lag }).logLikelihood();
    };
    const variants = [single, together, lagged, allLagged];
    for (const work of variants) for (let i = 0; i < 20; i++) work();
    const repeats = variants.map((work) => calibrateRepeat(work, batchSeconds));
    const perPoint: number[][] = variants.map(() => []);
    for (let round = 0; round < rounds; round++)
      variants.forEach((work, v) => perPoint[v].push(nanosecondsPerPoint(timeBatch(work, repeats[v]), repeats[v], n, "cpu")));
    const ratio = (v: number) => median(perPoint[v].map((x, k) => x / perPoint[0][k]));
    rows.push([
      String(n),
      formatSignificant(median(perPoint[0])),
      formatSignificant(median(perPoint[1])),
      formatSignificant(ratio(1)),
      formatSignificant(median(perPoint[2])),
      formatSignificant(ratio(2)),
      formatSignificant(median(perPoint[3])),
      formatSignificant(ratio(3)),
    ]);
  }
  console.log(
    markdownTable(["N", "single band ns/pt", "joint 6 bands ns/pt", "ratio", "one lag changing ns/pt", "ratio", "every lag changing ns/pt", "ratio"], rows),
  );
}

main();
