/**
 * The posterior methods compared on a realistic quasar catalogue (bench/batch-simulated-catalogue.ts:
 * about 200 epochs over ten seasons, observed-frame tau from 100 d to the baseline, 19-22 mag with
 * Ivezic et al. 2019 errors): for each object, the DRW fit by the default method ("auto": Pareto-smoothed
 * importance sampling, MCMC when its diagnostics fail) and by the walker ensemble alone ("mcmc"),
 * interleaved object by object so that both see the same machine load. Prints per method: seconds per
 * fit (median, 90th percentile, largest; process CPU time and wall), log-likelihood evaluations per fit
 * and per effective sample, converged fits, the fallbacks to MCMC, k-hat quantiles, and the coverage of
 * the true tau by the 68% and 95% intervals.
 *
 *   npx tsx bench/samplers-methods.ts [--objects 100] [--seed 1000] [--methods auto,mcmc]
 *
 * Prints figures; it is not a test.
 */
import { parseArgs } from "node:util";
import { fitLightCurve } from "../src/models/fit-light-curve.js";
import type { FitResult } from "../src/models/fit-result.js";
import { simulatedQuasars } from "./batch-simulated-catalogue.js";

interface Row {
  readonly cpu: number;
  readonly wall: number;
  readonly result: FitResult;
  readonly tau: number;
}

const { values } = parseArgs({
  options: {
    objects: { type: "string", default: "100" },
    seed: { type: "string", default: "1000" },
    methods: { type: "string", default: "auto,mcmc" },
  },
});
const methods = values.methods!.split(",") as ("auto" | "importance" | "mcmc")[];
const rows = new Map<string, Row[]>(methods.map((m) => [m, []]));
const cpuSeconds = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
const loadStart = (await import("node:os")).loadavg();
let k = 0;
for (const quasar of simulatedQuasars({ objects: Number(values.objects), seed: values.seed! })) {
  // Alternate which method goes first, so that neither always runs on a warmer cache.
  const order = k % 2 === 0 ? methods : [...methods].reverse();
  for (const method of order) {
    const c0 = cpuSeconds();
    const w0 = performance.now();
    const result = fitLightCurve(quasar.lightCurve, { model: "drw", seed: k, method });
    rows.get(method)!.push({ cpu: cpuSeconds() - c0, wall: (performance.now() - w0) / 1000, result, tau: quasar.tau });
  }
  k++;
}
const loadEnd = (await import("node:os")).loadavg();

const quantile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
};
const median = (v: number[]) => quantile(v, 0.5);
console.log(`posterior methods on ${k} simulated quasars (seed ${values.seed}); load average ${loadStart.map((x) => x.toFixed(2)).join(" ")} -> ${loadEnd.map((x) => x.toFixed(2)).join(" ")}`);
console.log("| method | fits | converged | by importance | CPU s/fit median | p90 | max | wall s/fit median | evaluations/fit median | p90 | evaluations per ESS (median) | k-hat median | p90 | max | tau in 68% | tau in 95% |");
console.log("| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |");
for (const method of methods) {
  const r = rows.get(method)!;
  const cpu = r.map((x) => x.cpu);
  const evals = r.map((x) => x.result.diagnostics.likelihoodEvaluations);
  const perEss = r.map((x) => x.result.diagnostics.likelihoodEvaluations / x.result.diagnostics.essMin);
  const ks = r.map((x) => x.result.diagnostics.paretoK).filter((v): v is number => typeof v === "number" && Number.isFinite(v));
  const byImportance = r.filter((x) => x.result.diagnostics.method === "importance").length;
  const in68 = r.filter((x) => x.result.parameters.tau!.q16 <= x.tau && x.tau <= x.result.parameters.tau!.q84).length;
  const in95 = r.filter((x) => x.result.parameters.tau!["q2.5"] <= x.tau && x.tau <= x.result.parameters.tau!["q97.5"]).length;
  const f = (x: number, d = 3) => x.toPrecision(d);
  console.log(
    `| ${method} | ${r.length} | ${r.filter((x) => x.result.diagnostics.converged).length} | ${byImportance} | ${f(median(cpu))} | ${f(quantile(cpu, 0.9))} | ${f(Math.max(...cpu))} | ${f(median(r.map((x) => x.wall)))} | ${median(evals).toFixed(0)} | ${quantile(evals, 0.9).toFixed(0)} | ${f(median(perEss))} | ${ks.length ? f(median(ks), 2) : "-"} | ${ks.length ? f(quantile(ks, 0.9), 2) : "-"} | ${ks.length ? f(Math.max(...ks), 2) : "-"} | ${in68}/${r.length} | ${in95}/${r.length} |`,
  );
  const fallbacks = r.map((x) => x.result.diagnostics.importanceFallback).filter((v): v is string => v !== undefined);
  if (fallbacks.length > 0) console.log(`  ${method}: ${fallbacks.length} fallbacks to MCMC, e.g. ${fallbacks.slice(0, 3).join(" | ")}`);
}
