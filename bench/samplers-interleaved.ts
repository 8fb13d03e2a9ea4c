/**
 * Interleaved likelihoods (issue 13): does evaluating several independent recursions side by side in
 * one pass over the points (as for the walkers of an ensemble, each at its own parameters) raise the
 * throughput per likelihood? A recursion is a chain of dependent operations per point, latency-bound, so
 * K independent chains in one loop could keep the pipeline full.
 *
 * The recursion measured is the damped random walk's O(N) likelihood written as a Kalman filter of the
 * Ornstein-Uhlenbeck process (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895, sec. 3, from memory;
 * common practice): a = exp(-dt / tau), predicted variance P = a^2 P' + sigma^2 (1 - a^2), innovation
 * r = y - a x', S = P + e^2, ln L += -(ln 2 pi S + r^2 / S) / 2, then the update. It is checked against
 * the engine's GaussianProcess.logLikelihood (relative difference printed), then timed one likelihood at
 * a time and K = 2, 4, 8, 16 at once (inner loop over the K parameter sets), process CPU time, blocks
 * interleaved, median of block ratios.
 *
 *   npx tsx bench/samplers-interleaved.ts [points=600] [blocks=15]
 *
 * Prints figures; it is not a test.
 */
import { loadavg } from "node:os";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { createRng } from "../src/random/rng.js";
import { seasonalTimes } from "./samplers-gp-models.js";

/** ln L of K damped random walks (tau[k], sigma[k], zero mean) on the same data, in one pass; written into out. */
function interleavedLogLikelihoods(time: Float64Array, value: Float64Array, error: Float64Array, tau: Float64Array, sigma: Float64Array, out: Float64Array): void {
  const K = tau.length;
  const x = new Float64Array(K);
  const p = new Float64Array(K);
  const variance = new Float64Array(K);
  const rate = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    variance[k] = sigma[k] * sigma[k];
    rate[k] = 1 / tau[k];
    p[k] = variance[k];
    x[k] = 0;
    out[k] = 0;
  }
  const logTwoPi = Math.log(2 * Math.PI);
  let previous = time[0];
  for (let i = 0; i < time.length; i++) {
    const dt = time[i] - previous;
    previous = time[i];
    const y = value[i];
    const e2 = error[i] * error[i];
    for (let k = 0; k < K; k++) {
      const a = Math.exp(-dt * rate[k]);
      const predicted = a * a * p[k] + variance[k] * (1 - a * a);
      const mean = a * x[k];
      const r = y - mean;
      const s = predicted + e2;
      out[k] = out[k] - 0.5 * (logTwoPi + Math.log(s) + (r * r) / s);
      const gain = predicted / s;
      x[k] = mean + gain * r;
      p[k] = (1 - gain) * predicted;
    }
  }
}

function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

const n = Number(process.argv[2] ?? 600);
const blocks = Number(process.argv[3] ?? 15);
const rng = createRng("interleaved-walkers");
const time = seasonalTimes(n, rng);
const error = Float64Array.from(time, () => 0.02 + 0.01 * rng.uniform());
const truth = kernels.dampedRandomWalk({ sigma: 0.2, tau: 150 });
const latent = new GaussianProcess(truth, time).priorDraw(rng);
const value = Float64Array.from(latent, (v, i) => v + error[i] * rng.normal());

// Correctness: the filter against the engine at a few parameter sets.
const checkTau = Float64Array.of(30, 150, 900);
const checkSigma = Float64Array.of(0.1, 0.2, 0.4);
const filtered = new Float64Array(3);
interleavedLogLikelihoods(time, value, error, checkTau, checkSigma, filtered);
let worst = 0;
checkTau.forEach((tau, k) => {
  const engine = new GaussianProcess(kernels.dampedRandomWalk({ sigma: checkSigma[k]!, tau }), time, { errors: error }).logLikelihood(value);
  worst = Math.max(worst, Math.abs(filtered[k]! - engine) / Math.abs(engine));
});
console.log(`interleaved likelihoods, damped random walk, ${n} points; load average ${loadavg().map((v) => v.toFixed(2)).join(" ")}`);
console.log(`filter against the engine: largest relative difference of ln L ${worst.toExponential(1)}`);

const widths = [1, 2, 4, 8, 16];
const sets = widths.map((K) => ({
  K,
  tau: Float64Array.from({ length: K }, (_, k) => 50 * Math.pow(1.3, k)),
  sigma: Float64Array.from({ length: K }, (_, k) => 0.1 + 0.01 * k),
  out: new Float64Array(K),
}));
// Each block: about 16 likelihoods per width, so every width does the same work.
const perBlock = Math.max(16, Math.round(4e6 / n));
const nsPerPoint: number[][] = widths.map(() => []);
let sink = 0;
for (let b = 0; b < blocks + 2; b++) {
  sets.forEach((set, w) => {
    const calls = Math.max(1, Math.round(perBlock / set.K));
    const t0 = cpuMs();
    for (let c = 0; c < calls; c++) {
      interleavedLogLikelihoods(time, value, error, set.tau, set.sigma, set.out);
      sink += set.out[0]!;
    }
    const ns = ((cpuMs() - t0) * 1e6) / (calls * set.K * n);
    if (b >= 2) nsPerPoint[w]!.push(ns);
  });
}
if (!Number.isFinite(sink)) throw new Error("non-finite likelihood");
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!;
const single = median(nsPerPoint[0]!);
console.log("| likelihoods at once (K) | ns per point per likelihood (median of blocks) | throughput against one at a time |");
console.log("| --- | --- | --- |");
widths.forEach((K, w) => {
  const ns = median(nsPerPoint[w]!);
  console.log(`| ${K} | ${ns.toFixed(2)} | ${(single / ns).toFixed(2)} |`);
});
