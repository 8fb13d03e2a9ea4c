/**
 * Simulation-based calibration of the damped-random-walk model (see samplers-calibration.ts), the
 * slow version: many replicates with a fixed seed. Prints the rank histograms and the chi-square
 * p-values of uniformity; exits non-zero when a p-value is below 0.01 / (number of parameters).
 *
 * Run: npx tsx bench/samplers-sbc.ts [replicates=200] [nuts|ensemble] [seed=31]
 */
import { DEFAULT_SAMPLER, type SamplerKind } from "../src/inference/sample-posterior.js";
import { runCalibration } from "./samplers-calibration.js";

const replicates = Number(process.argv[2] ?? 200);
const sampler = (process.argv[3] ?? DEFAULT_SAMPLER) as SamplerKind;
const seed = Number(process.argv[4] ?? 31);
const started = performance.now();
const result = runCalibration({
  replicates,
  drawsPerRank: 99,
  bins: 10,
  sampler,
  seed,
  onReplicate: (i, converged) => {
    if ((i + 1) % 10 === 0 || !converged) {
      const elapsed = (performance.now() - started) / 1000;
      console.error(`replicate ${i + 1}/${replicates}${converged ? "" : " (not converged)"}, ${elapsed.toFixed(0)} s`);
    }
  },
});
console.log(`simulation-based calibration, damped random walk, ${sampler}, ${replicates} replicates, seed ${seed}`);
console.log(`converged fits: ${result.converged}/${replicates}; ranks among 99 draws, 10 bins`);
const threshold = 0.01 / result.names.length;
let failed = false;
result.names.forEach((name, i) => {
  const p = result.pValues[i]!;
  if (p < threshold) failed = true;
  console.log(`${name.padEnd(6)} histogram ${result.histograms[i]!.map((c) => String(c).padStart(3)).join(" ")}  chi-square p = ${p.toFixed(3)}`);
});
console.log(`${((performance.now() - started) / 1000).toFixed(0)} s; ${failed ? "FAILED" : "passed"} (every p >= ${threshold.toFixed(4)})`);
process.exitCode = failed ? 1 : 0;
