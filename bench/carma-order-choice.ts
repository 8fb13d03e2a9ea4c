/**
 * CARMA order choice by evidence (issue 14): light curves simulated from a CARMA(2,1) process (Kelly et al.
 * 2014, ApJ 788, 33: a(s) = s^2 + (w0 / Q) s + w0^2, b(s) = 1 + b1 s) on a seasonal ground cadence, compared
 * over the CARMA grid (p <= 4, q < p) by `compareModels` (evidence by importance sampling at each mode,
 * with its Monte Carlo error). Then the CARMA(2,1) posterior of each light curve (`fitLightCurve`) and
 * whether the truth lies in its 68% and 95% intervals. Invented truth: a damped oscillation of undamped
 * period 90 d and quality 1.5 (a bump in the PSD) with a moving-average coefficient of 25 d (above the
 * bump the PSD falls as f^-2, not f^-4), sigma 0.2 mag; six seasons, a night every 2 d, 0.015 mag errors.
 *
 * Prints, per light curve, the preferred order, ln B over the runner-up with its standard error, the rank
 * of CARMA(2,1), the estimator of each evidence (importance sampling, bridge sampling from MCMC draws, or
 * Laplace: the orders not by importance sampling named with their k-hat), the comparison's CPU seconds,
 * and the (2,1) posterior medians; then how often each order was chosen, the evidences by estimator (all,
 * and among the top two of each comparison), and the coverage.
 * Slow (ten optimisations, ten evidence estimates and one fit per light curve): run it at low priority.
 * Nothing is asserted.
 *
 * `--ma1-from-prior`: each light curve's ma1 is drawn from the fit's own prior on it (`buildModel` on the
 * light curve's times; a separate random stream), the other parameters as above, so the ma1 coverage is
 * that of truths the prior could have produced (a check conditional on the fixed sigma, period0, quality0,
 * which the data constrain well; not a full simulation-based calibration).
 *
 *   nice -n 19 npx tsx bench/carma-order-choice.ts [--curves K] [--first K0] [--skip-fit | --fit-only] [--ma1-from-prior] > carma-order.md
 */
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { compareModels } from "../src/models/compare-models.js";
import { summarizeLightCurve } from "../src/models/data-summary.js";
import { fitLightCurve } from "../src/models/fit-light-curve.js";
import { buildModel } from "../src/models/light-curve-model.js";
import { createRng } from "../src/random/rng.js";
import { formatSignificant, markdownTable } from "./engine-timing.js";
import { numberArgument } from "./command-line.js";

const TRUTH: Readonly<Record<string, number>> = { sigma: 0.2, period0: 90, quality0: 1.5, ma1: 25 };
const ERROR = 0.015;

function lightCurveOf(k: number, time: Float64Array, value: Float64Array): LightCurve {
  const error = Float64Array.from(time, () => ERROR);
  return { time, value, error, unit: "mag", provenance: { source: `carma-${k}`, timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false } };
}

/** ma1 drawn from the CARMA(2,1) fit's prior on it, which depends only on the times (cadence and baseline). */
function ma1FromPrior(k: number, time: Float64Array): number {
  const summary = summarizeLightCurve(lightCurveOf(k, time, Float64Array.from(time, (_, i) => i % 2)));
  const prior = buildModel("carma", summary, { order: { p: 2, q: 1 } }).space.free.find((p) => p.name === "ma1")!.prior;
  return prior.quantile(createRng(`bench:carma-order:ma1:${k}`).uniform());
}

function simulated(k: number, drawMa1: boolean): { lightCurve: LightCurve; truth: Record<string, number> } {
  const rng = createRng(`bench:carma-order:${k}`);
  const time = seasonalGroundCadence({ seasons: 6, revisitInterval: 2 }, rng);
  const truth: Record<string, number> = drawMa1 ? { ...TRUTH, ma1: ma1FromPrior(k, time) } : { ...TRUTH };
  const kernel = kernels.carma({
    sigma: truth.sigma ?? 0,
    oscillations: [{ period: truth.period0 ?? 0, quality: truth.quality0 ?? 0 }],
    movingAverage: [truth.ma1 ?? 0],
  });
  const latent = new GaussianProcess(kernel, time).priorDraw(rng);
  return { lightCurve: lightCurveOf(k, time, Float64Array.from(latent, (v) => 19 + v + ERROR * rng.normal())), truth };
}

function main(): void {
  const curves = numberArgument("curves", 20);
  const first = numberArgument("first", 0);
  // Either half alone, to split a long run over processes: the order choice, or the (2,1) posterior.
  const skipFit = process.argv.includes("--skip-fit");
  const fitOnly = process.argv.includes("--fit-only");
  const drawMa1 = process.argv.includes("--ma1-from-prior");
  const chosen = new Map<string, number>();
  const inside = { 68: new Map<string, number>(), 95: new Map<string, number>() };
  const names = Object.keys(TRUTH);
  const started = performance.now();
  let points = 0;
  const estimators = { all: new Map<string, number>(), topTwo: new Map<string, number>() };
  const comparisonSeconds: number[] = [];
  const header = ["curve", "N", "preferred order", "runner-up: ln B ± s.e. (scale)", "rank of (2,1)", "evidences by importance / bridge / Laplace (orders not by importance: k-hat)", "comparison CPU s", ...names.map((n) => `${n} (${drawMa1 && n === "ma1" ? "prior draw" : TRUTH[n]}) median (interval holding the truth)`), "(2,1) fit"];
  // The table row by row as the curves finish (a long run can be read, or stopped, part-way).
  console.log(markdownTable(header, []));
  for (let k = first; k < first + curves; k++) {
    const { lightCurve, truth: truths } = simulated(k, drawMa1);
    points += lightCurve.time.length;
    const cpuBefore = process.cpuUsage().user;
    const comparison = fitOnly ? undefined : compareModels(lightCurve, ["carma"], { seed: k + 1 });
    const cpu = (process.cpuUsage().user - cpuBefore) / 1e6;
    if (comparison) comparisonSeconds.push(cpu);
    comparison?.ranking.forEach((s, i) => {
      estimators.all.set(s.evidenceMethod, (estimators.all.get(s.evidenceMethod) ?? 0) + 1);
      if (i < 2) estimators.topTwo.set(s.evidenceMethod, (estimators.topTwo.get(s.evidenceMethod) ?? 0) + 1);
    });
    const byMethod = (method: string) => comparison?.ranking.filter((s) => s.evidenceMethod === method).length ?? 0;
    const others = comparison?.ranking
      .filter((s) => s.evidenceMethod !== "importance")
      .map((s) => `${s.label} ${s.evidenceMethod} (k-hat ${s.evidenceParetoShape?.toFixed(2) ?? "none"})`)
      .join(", ");
    const preference = comparison?.carmaOrder;
    const best = comparison?.ranking[0];
    if (best) chosen.set(best.label, (chosen.get(best.label) ?? 0) + 1);
    const rank = comparison ? comparison.ranking.findIndex((s) => s.order === "2,1") + 1 : 0;
    const fit = skipFit ? undefined : fitLightCurve(lightCurve, { model: "carma", order: { p: 2, q: 1 }, seed: 100 + k });
    const medians = names.map((name) => {
      const summary = fit?.parameters[name];
      const truth = truths[name] ?? NaN;
      if (!summary) return "-";
      const in68 = summary.q16 <= truth && truth <= summary.q84;
      const in95 = summary["q2.5"] <= truth && truth <= summary["q97.5"];
      if (in68) inside[68].set(name, (inside[68].get(name) ?? 0) + 1);
      if (in95) inside[95].set(name, (inside[95].get(name) ?? 0) + 1);
      return `${formatSignificant(summary.median)}${drawMa1 && name === "ma1" ? ` [truth ${formatSignificant(truth)}]` : ""} ${in68 ? "(68)" : in95 ? "(95)" : "(out)"}`;
    });
    const row = [
      String(k),
      String(lightCurve.time.length),
      best?.label ?? "-",
      preference ? `${preference.over}: ${preference.logBayesFactor.toFixed(2)} ± ${preference.standardError?.toFixed(2) ?? "laplace"} (${preference.strength})` : "-",
      rank > 0 ? String(rank) : "-",
      comparison ? `${byMethod("importance")} / ${byMethod("bridge")} / ${byMethod("laplace")}${others ? `: ${others}` : ""}` : "-",
      comparison ? cpu.toFixed(1) : "-",
      ...medians,
      fit ? (fit.diagnostics.converged ? fit.diagnostics.method : "not converged") : "-",
    ];
    console.log(`| ${row.join(" | ")} |`);
    console.error(`curve ${k}: ${best?.label} (carma(2,1) rank ${rank}), ${((performance.now() - started) / 1000).toFixed(0)} s so far`);
  }
  console.log(`\nOrders chosen over ${curves} light curves (mean ${Math.round(points / curves)} points):`);
  console.log(markdownTable(["order", "chosen"], [...chosen.entries()].sort((a, b) => b[1] - a[1]).map(([order, count]) => [order, String(count)])));
  const counts = (m: Map<string, number>) => ["importance", "bridge", "laplace"].map((method) => String(m.get(method) ?? 0));
  console.log("\nEvidences by estimator:");
  console.log(markdownTable(["evidences", "importance", "bridge", "laplace"], [["all orders", ...counts(estimators.all)], ["top two of each comparison", ...counts(estimators.topTwo)]]));
  if (comparisonSeconds.length > 0) {
    const sorted = [...comparisonSeconds].sort((a, b) => a - b);
    console.log(`\nComparison CPU s: median ${sorted[Math.floor(sorted.length / 2)]?.toFixed(1)}, range ${sorted[0]?.toFixed(1)}-${sorted[sorted.length - 1]?.toFixed(1)}`);
  }
  console.log(`\nTruth inside the CARMA(2,1) posterior's central intervals (of ${curves}; binomial expectation 68% -> ${(0.68 * curves).toFixed(1)}, 95% -> ${(0.95 * curves).toFixed(1)}):`);
  console.log(markdownTable(["parameter", "in 68%", "in 95%"], names.map((n) => [n, String(inside[68].get(n) ?? 0), String(inside[95].get(n) ?? 0)])));
  console.log(`\nwall ${((performance.now() - started) / 1000).toFixed(0)} s; CPU ${(process.cpuUsage().user / 1e6).toFixed(0)} s`);
}

main();
