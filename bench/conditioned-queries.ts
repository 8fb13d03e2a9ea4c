/**
 * What `gp.given(values)` saves on repeated queries: the smoother's states kept at every data point
 * (src/linalg/semiseparable-conditioned-states.ts) against one smoother pass over data and requested
 * times together per query (src/linalg/semiseparable-smoother.ts, what every `at` call cost before).
 * A second table times the joint covariance at M times: `covarianceAt` (one solve and one semiseparable
 * product per column, O(M (N + M) R)) against the explicit dot products k_a^T K^{-1} k_b it replaced
 * (O(M^2 N)). Prints Markdown tables; figures in ms (wall clock, medians of 5 rounds). Run with
 * `npm run build && node dist/bench/conditioned-queries.js` on an otherwise idle machine.
 */
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { semiseparablePredict } from "../src/linalg/semiseparable-smoother.js";
import { createRng } from "../src/random/rng.js";
import { benchmarkData, engineCases } from "./engine-cases.js";
import { calibrateRepeat, formatSignificant, markdownTable, median, timeBatch } from "./engine-timing.js";

const ROUNDS = 5;
const BATCH_SECONDS = 0.3;
const QUERY_TIMES = 10;

/** Median ms per call of `work` over ROUNDS batches of about BATCH_SECONDS. */
function msPerCall(work: () => number): number {
  work();
  const repeat = calibrateRepeat(work, BATCH_SECONDS);
  const rounds: number[] = [];
  for (let k = 0; k < ROUNDS; k++) rounds.push((1000 * timeBatch(work, repeat).seconds) / repeat);
  return median(rounds);
}

/** `m` sorted times spread over the data's span, gaps included. */
function spread(time: Float64Array, m: number): Float64Array {
  const start = time[0];
  const span = time[time.length - 1] - start;
  return Float64Array.from({ length: m }, (_, i) => start + (span * (i + 0.37)) / m);
}

const rows: string[][] = [];
for (const engineCase of (process.argv.includes("--covariance-only") ? [] : engineCases()).filter((c) => [1, 2, 4].includes(c.components))) {
  for (const n of [10_000, 100_000]) {
    const data = benchmarkData(engineCase.kernel, n, createRng(`conditioned-queries:${engineCase.label}:${n}`));
    const gp = new GaussianProcess(engineCase.kernel, data.time, { errors: data.errors, mean: data.mean });
    const form = engineCase.kernel.semiseparableForm()!;
    const noise = Float64Array.from(data.errors, (e) => e * e);
    const residual = Float64Array.from(data.value, (v) => v - data.mean);
    const few = spread(data.time, QUERY_TIMES);
    const merged = msPerCall(() => semiseparablePredict(form, data.time, noise, residual, few).mean[0]);
    const firstCall = msPerCall(() => gp.given(data.value).at(few).mean[0]);
    const secondCall = msPerCall(() => {
      const fresh = gp.given(data.value);
      fresh.at(few);
      return fresh.at(few).mean[0];
    }) - firstCall;
    const given = gp.given(data.value);
    given.at(few);
    given.at(few);
    const laterCall = msPerCall(() => given.at(few).mean[0]);
    rows.push([
      String(engineCase.components),
      n.toExponential(0),
      formatSignificant(merged),
      formatSignificant(firstCall),
      formatSignificant(secondCall),
      formatSignificant(laterCall),
      formatSignificant(merged / laterCall),
    ]);
    console.error(`done: R = ${engineCase.components}, N = ${n}`);
  }
}
const covarianceRows: string[][] = [];
const COVARIANCE_TIMES = 200;
for (const engineCase of engineCases().filter((c) => [1, 2, 4].includes(c.components))) {
  const n = 10_000;
  const data = benchmarkData(engineCase.kernel, n, createRng(`conditioned-covariance:${engineCase.label}`));
  const gp = new GaussianProcess(engineCase.kernel, data.time, { errors: data.errors, mean: data.mean });
  const times = spread(data.time, COVARIANCE_TIMES);
  const given = gp.given(data.value);
  const product = msPerCall(() => given.covarianceAt(times)[1]);
  const dots = msPerCall(() => dotProductCovariance(gp, times)[1]);
  covarianceRows.push([String(engineCase.components), n.toExponential(0), String(COVARIANCE_TIMES), formatSignificant(dots), formatSignificant(product), formatSignificant(dots / product)]);
  console.error(`done: covariance, R = ${engineCase.components}`);
}

console.log(`\n## Repeated queries of the conditioned process (M = ${QUERY_TIMES} times per query, ms per call)\n`);
console.log(
  markdownTable(
    ["R", "N", "one smoother pass", "given + first at", "second at (keeps the states)", "later at", "later at vs one pass"],
    rows,
  ),
);
console.log(`\n## Joint covariance at M times (ms per call)\n`);
console.log(markdownTable(["R", "N", "M", "dot products k_a^T K^-1 k_b", "covarianceAt", "ratio"], covarianceRows));

/** The joint covariance by explicit dot products of the solved columns: the method covarianceAt replaced. */
function dotProductCovariance(gp: GaussianProcess, times: Float64Array): Float64Array {
  const t = gp.time;
  const m = times.length;
  const cross = Array.from({ length: m }, (_, j) => Float64Array.from(t, (ti) => gp.kernel.covarianceAt(ti - times[j])));
  const solved = cross.map((column) => gp.solve(column));
  const covariance = new Float64Array(m * m);
  for (let a = 0; a < m; a++)
    for (let b = a; b < m; b++) {
      let explained = 0;
      for (let i = 0; i < t.length; i++) explained += cross[a][i] * solved[b][i];
      covariance[a * m + b] = covariance[b * m + a] = gp.kernel.covarianceAt(times[a] - times[b]) - explained;
    }
  return covariance;
}
