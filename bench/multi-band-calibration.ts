/**
 * Calibration of the joint multi-band DRW fit (issue 14) on simulated interleaved six-band quasars:
 * seasonal gaps (three seasons, one visit a night, 30% lost to weather, 360 visits), per-band depths,
 * amplitudes falling with wavelength, one shared damped random walk. Truths from a fixed distribution
 * (tau log-uniform 50-600 d, sigma log-uniform 0.1-0.3 mag in g, amplitude ratios 1.3 to 0.7 times a
 * random tilt). For every light curve: the joint fit (default method) and each band on its own. Prints:
 * - coverage of the true tau by the joint 68% and 95% intervals, with the binomial 95% band of the count
 *   (@stdlib/stats binomial quantiles);
 * - the median ratio of the joint 68% interval's width in ln tau to the best single band's;
 * - the amplitude ratios' errors and their 68% coverage;
 * - rank statistics (simulation-based calibration, Talts et al. 2018, from memory): the rank of each
 *   truth among 99 posterior draws, 10-bin histograms and the chi-square p-value of uniformity. The
 *   fit's priors are built from each light curve's data, not the distribution the truths come from, so
 *   these ranks test calibration only approximately (a data-driven prior that is much wider than the
 *   truths' distribution pushes ranks towards the middle).
 * With --lags: lags of 1-8 d (u leads, longer wavelengths follow), their recovery within the 68% / 95%
 * intervals. Nothing is asserted. Statistical, not timed: run at the lowest priority.
 *
 *   nice -n 19 npx tsx bench/multi-band-calibration.ts [--curves K] [--seed S] [--lags]
 */
import binomialQuantile from "@stdlib/stats/base/dists/binomial/quantile";
import { fitJointDetailed } from "../src/models/fit-joint.js";
import { fitLightCurve } from "../src/models/fit-light-curve.js";
import { QUASAR_BAND_NAMES, simulatedSixBandQuasar } from "../src/models/simulated-quasar-bands.js";
import { createRng } from "../src/random/rng.js";
import { formatSignificant, markdownTable, median } from "./engine-timing.js";
import { rankOfTruth, rankUniformity } from "./samplers-calibration.js";
import { numberArgument } from "./command-line.js";


function main(): void {
  const curves = numberArgument("curves", 40);
  const seed = numberArgument("seed", 14);
  const lags = process.argv.includes("--lags");
  const ranked = ["tau", "sigma", "amplitude.u", "amplitude.r", "amplitude.y", ...(lags ? ["lag.u", "lag.y"] : [])];
  const ranks: number[][] = ranked.map(() => []);
  let in68 = 0;
  let in95 = 0;
  let converged = 0;
  let amplitudeIn68 = 0;
  let amplitudeCount = 0;
  let lagIn68 = 0;
  let lagIn95 = 0;
  let lagCount = 0;
  const widthRatios: number[] = [];
  const amplitudeErrors: number[] = [];
  const methods: Record<string, number> = {};
  const fitSeconds: number[] = [];
  for (let c = 0; c < curves; c++) {
    const rng = createRng(`bench:multi-band-calibration:${seed}:${c}`);
    const quasar = simulatedSixBandQuasar(rng, { lags, source: `calibration-${c}` });
    const { tau, lightCurves } = quasar;
    const lagOf = quasar.lags;
    const bands = QUASAR_BAND_NAMES.map((name, b) => ({ name, amplitude: quasar.amplitudes[b] ?? NaN, lag: lagOf[b] ?? 0 }));
    const cpuStart = process.cpuUsage();
    const fit = fitJointDetailed(lightCurves, { model: "drw", seed: seed * 1000 + c, referenceBand: "g", ...(lags ? { lags: true } : {}) });
    const cpu = process.cpuUsage(cpuStart);
    const p = fit.result.parameters;
    const d = fit.result.diagnostics;
    const method = d.importanceFallback !== undefined ? `${d.method} after importance` : (d.method ?? "?");
    methods[method] = (methods[method] ?? 0) + 1;
    if (d.converged) converged++;
    fitSeconds.push((cpu.user + cpu.system) / 1e6);
    const t = p.tau;
    if (!t) continue;
    if (t.q16 <= tau && tau <= t.q84) in68++;
    if (t["q2.5"] <= tau && tau <= t["q97.5"]) in95++;
    const single = lightCurves.map((lc, b) => {
      const s = fitLightCurve(lc, { model: "drw", seed: seed * 1000 + c + 100 * (b + 1) }).parameters.tau;
      return s ? Math.log(s.q84 / s.q16) : Infinity;
    });
    widthRatios.push(Math.log(t.q84 / t.q16) / single.reduce((a, w) => Math.min(a, w), Infinity));
    bands.forEach((band) => {
      const a = p[`amplitude.${band.name}`];
      if (!a || band.name === "g") return;
      amplitudeCount++;
      amplitudeErrors.push(Math.abs(a.median / band.amplitude - 1));
      if (a.q16 <= band.amplitude && band.amplitude <= a.q84) amplitudeIn68++;
      const l = p[`lag.${band.name}`];
      if (!l) return;
      lagCount++;
      if (l.q16 <= band.lag && band.lag <= l.q84) lagIn68++;
      if (l["q2.5"] <= band.lag && band.lag <= l["q97.5"]) lagIn95++;
    });
    const truth: Record<string, number> = { tau, sigma: quasar.sigma, "amplitude.u": bands[0]?.amplitude ?? NaN, "amplitude.r": bands[2]?.amplitude ?? NaN, "amplitude.y": bands[5]?.amplitude ?? NaN, "lag.u": lagOf[0] ?? NaN, "lag.y": lagOf[5] ?? NaN };
    const draws = fit.draws;
    ranked.forEach((name, i) => {
      const column = draws.columns[name];
      if (column) ranks[i]?.push(rankOfTruth(column, truth[name] ?? NaN, 99));
    });
    if ((c + 1) % 10 === 0 || c + 1 === curves) report(c + 1);
  }

  function report(done: number): void {
    const band = (p: number) => `${binomialQuantile(0.025, done, p)}-${binomialQuantile(0.975, done, p)}`;
    const cpu = Float64Array.from(fitSeconds).sort();
    console.log(`\n### ${done} light curves (seed ${seed}${lags ? ", lags" : ""}; methods ${JSON.stringify(methods)}; converged ${converged}; joint fit CPU s median ${formatSignificant(median(fitSeconds))}, max ${formatSignificant(cpu[cpu.length - 1] ?? NaN)})\n`);
    console.log(markdownTable(["figure", "value", "binomial 95% band"], [
      ["true tau in the joint 68% interval", String(in68), band(0.68)],
      ["true tau in the joint 95% interval", String(in95), band(0.95)],
      ["median width ratio ln(q84/q16), joint / best single band", formatSignificant(median(widthRatios)), "-"],
      ["amplitude ratios in their 68% interval", `${amplitudeIn68} of ${amplitudeCount}`, amplitudeCount ? `${binomialQuantile(0.025, amplitudeCount, 0.68)}-${binomialQuantile(0.975, amplitudeCount, 0.68)}` : "-"],
      ["median amplitude-ratio error %", formatSignificant(100 * median(amplitudeErrors), 2), "-"],
      ...(lags ? [["lags in their 68% / 95% intervals", `${lagIn68} / ${lagIn95} of ${lagCount}`, lagCount ? `${binomialQuantile(0.025, lagCount, 0.68)}-${binomialQuantile(0.975, lagCount, 0.68)} / ${binomialQuantile(0.025, lagCount, 0.95)}-${binomialQuantile(0.975, lagCount, 0.95)}` : "-"]] : []),
    ]));
    const { histograms, pValues } = rankUniformity(ranks, 99, 10);
    console.log("\n" + markdownTable(["parameter", "rank histogram (10 bins)", "chi-square p"], ranked.map((name, i) => [name, (histograms[i] ?? []).join(" "), formatSignificant(pValues[i] ?? NaN)])));
  }
}

main();
