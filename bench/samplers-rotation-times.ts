/**
 * Seconds per quasi-periodic fit (issue 13): (a) spotted stars of the invented survey's space stare,
 * 1000 points one per hour (rotation periods 3-12 d, decay times 2-6 periods); (b) a 40-year ground-based
 * record of 2000 points (40 seasons of 50 visits) with a slow damped-random-walk background
 * (`--background drw`). Each light curve is fitted by the default method (`method: "auto"`: importance
 * sampling from a mixture with a component at every period mode found, MCMC when its diagnostics fail;
 * fitMethod in src/models/fit-sampling.ts) and, with `--mcmc`, also by the walker ensemble alone, interleaved.
 * Prints per case and method: process CPU seconds per fit (median, largest), wall seconds, likelihood
 * evaluations, the method used, k-hat, and whether the truth lies in the 95% interval of the period.
 *
 *   npx tsx bench/samplers-rotation-times.ts [--stars 5] [--records 3] [--mcmc] [--seed 7]
 *
 * Prints figures; it is not a test.
 */
import { loadavg } from "node:os";
import { parseArgs } from "node:util";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { continuousSpaceCadence, seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { fitLightCurve } from "../src/models/fit-light-curve.js";
import type { FitOptions } from "../src/models/fit-options.js";
import type { FitResult } from "../src/models/fit-result.js";
import { childSeed, createRng } from "../src/random/rng.js";

interface Case {
  readonly label: string;
  readonly lightCurve: LightCurve;
  readonly period: number;
  readonly options: Omit<FitOptions, "seed">;
}

function lightCurveOf(time: Float64Array, latent: Float64Array, error: number, rng: ReturnType<typeof createRng>, source: string): LightCurve {
  return {
    time,
    value: Float64Array.from(latent, (v) => v + error * rng.normal()),
    error: new Float64Array(time.length).fill(error),
    unit: "mag",
    provenance: { source, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
  };
}

/** A spotted star: 1000 hourly points, period 3-12 d, decay time 2-6 periods, 0.01 mag spots, 2 mmag errors. */
function spottedStar(k: number, seed: string): Case {
  const rng = createRng(childSeed(seed, k));
  const period = 3 * Math.pow(4, rng.uniform());
  const decayTime = period * (2 + 4 * rng.uniform());
  const time = continuousSpaceCadence({ start: 0, duration: 1100 / 24, interval: 1 / 24 }, rng).slice(0, 1000);
  const kernel = kernels.quasiPeriodic({ sigma: 0.01, period, decayTime, harmonicWeight: 0.2 + 0.4 * rng.uniform() });
  const latent = new GaussianProcess(kernel, time, { mean: 12 }).priorDraw(rng);
  return { label: "quasi-periodic, 1000 points", lightCurve: lightCurveOf(time, latent, 0.002, rng, `star ${k}`), period, options: { model: "quasi-periodic" } };
}

/** A 40-year record: 40 seasons of about 50 visits, period 15-40 d, and a DRW background of tau 1000-4000 d. */
function longRecord(k: number, seed: string): Case {
  const rng = createRng(childSeed(seed, 1000 + k));
  const period = 15 * Math.pow(40 / 15, rng.uniform());
  const all = seasonalGroundCadence({ start: 40000, seasons: 40, revisitInterval: 2.5, weatherLoss: 0.3 }, rng);
  const time = all.slice(0, Math.min(all.length, 2000));
  const kernel = kernels
    .quasiPeriodic({ sigma: 0.01, period, decayTime: 3 * period, harmonicWeight: 0.3 })
    .plus(kernels.dampedRandomWalk({ sigma: 0.02, tau: 1000 * Math.pow(4, rng.uniform()) }));
  const latent = new GaussianProcess(kernel, time, { mean: 11 }).priorDraw(rng);
  return {
    label: `quasi-periodic + DRW background, ${time.length} points over 40 years`,
    lightCurve: lightCurveOf(time, latent, 0.004, rng, `record ${k}`),
    period,
    options: { model: "quasi-periodic", background: "drw" },
  };
}

const { values } = parseArgs({
  options: { stars: { type: "string", default: "5" }, records: { type: "string", default: "3" }, mcmc: { type: "boolean", default: false }, seed: { type: "string", default: "7" } },
});
const methods: ("auto" | "mcmc")[] = values.mcmc ? ["auto", "mcmc"] : ["auto"];
const cases = [
  ...Array.from({ length: Number(values.stars) }, (_, k) => spottedStar(k, values.seed!)),
  ...Array.from({ length: Number(values.records) }, (_, k) => longRecord(k, values.seed!)),
];
const cpu = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
console.log(`quasi-periodic fit times, seed ${values.seed}; load average at start ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
console.log("| case | method asked | method used | CPU s | wall s | likelihood evaluations | k-hat | ESS | converged | period in 95% | period modes (share) |");
console.log("| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |");
const rows: { label: string; method: string; cpu: number }[] = [];
cases.forEach((c, k) => {
  for (const method of k % 2 === 0 ? methods : [...methods].reverse()) {
    const c0 = cpu();
    const w0 = performance.now();
    const result: FitResult = fitLightCurve(c.lightCurve, { ...c.options, seed: k, method });
    const seconds = cpu() - c0;
    const d = result.diagnostics;
    const p = result.parameters.period!;
    rows.push({ label: c.label, method, cpu: seconds });
    console.log(
      `| ${c.label} | ${method} | ${d.method} | ${seconds.toFixed(2)} | ${((performance.now() - w0) / 1000).toFixed(2)} | ${d.likelihoodEvaluations.toFixed(0)} | ${d.paretoK?.toFixed(2) ?? "-"} | ${d.essMin.toFixed(0)} | ${d.converged} | ${p["q2.5"] <= c.period && c.period <= p["q97.5"]} | ${(result.periodModes ?? []).map((m) => `${m.period.toPrecision(4)} (${m.probability.toFixed(2)})`).join(", ")} |`,
    );
  }
});
for (const label of new Set(rows.map((r) => r.label))) {
  for (const method of methods) {
    const t = rows.filter((r) => r.label === label && r.method === method).map((r) => r.cpu).sort((a, b) => a - b);
    if (t.length > 0) console.log(`${label}, ${method}: median ${t[t.length >> 1].toFixed(2)} CPU s, largest ${t[t.length - 1].toFixed(2)} (${t.length} fits)`);
  }
}
console.log(`load average at end ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
