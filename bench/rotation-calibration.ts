/**
 * Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788) of
 * the quasi-periodic rotation model, the slow check of its period and decay time (test/models has the
 * fast recovery and coverage test). For each replicate: parameters are drawn from the prior below, a
 * light curve is simulated from them on a continuous stare with downlink gaps, the posterior is sampled
 * from the periodogram's first guess (as a fit does), and the rank of each true value among 99 posterior
 * draws is recorded. If priors, likelihood, transforms and sampler are right, every rank is uniform; a
 * chi-square test (stdlib chi2gof) of 10-bin histograms checks this per parameter. Exits non-zero when a
 * p-value is below 0.01 / (number of parameters).
 *
 * The prior keeps harmonicWeight below 1/2, so that `period` is always the dominant period: (period,
 * harmonicWeight = 1) and (period / 2, harmonicWeight = 0) are the same kernel, a label switch that the
 * fit resolves by its search over P, P/2 and 2P (models/period-modes.ts), not the sampler.
 *
 * "fit" (the default) calibrates the path of a quasi-periodic fit (models/fit-light-curve.ts) with the
 * calibration priors: the period modes at P, P/2 and 2P of the periodogram's three highest peaks (fit-mode-plan.ts),
 * the mean integrated out, the posterior by the fit's default method (importance sampling from a
 * mixture with a component per mode, MCMC when its diagnostics fail; fit-sampling.ts), the mean drawn
 * back. "nuts" and "ensemble" run that sampler from the periodogram's peak on the full space.
 *
 * Run: npx tsx bench/rotation-calibration.ts [replicates=100] [seed=41] [fit|nuts|ensemble]
 * Figures of the runs are recorded in bench/README.md.
 */
import { createParameterSpace, type ParameterSpace } from "../src/inference/parameter-space.js";
import { logUniformPrior, normalPrior, uniformPrior } from "../src/inference/priors.js";
import { posteriorDraws } from "../src/inference/posterior-draws.js";
import { samplePosterior, type SamplerKind } from "../src/inference/sample-posterior.js";
import type { PosteriorDraws } from "../src/inference/posterior-draws.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { summarizeLightCurve } from "../src/models/data-summary.js";
import { restoredPosterior } from "../src/models/fit-mean-restoration.js";
import { planModes } from "../src/models/fit-mode-plan.js";
import { SEARCHED_PEAKS } from "../src/models/fit-period-search.js";
import { pooledDraws } from "../src/models/fit-pooling.js";
import { sampleStarts } from "../src/models/fit-sampling.js";
import { buildModel, modelLikelihood } from "../src/models/light-curve-model.js";
import { combinedDiagnostics } from "../src/models/fit-diagnostics.js";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { continuousSpaceCadence } from "../src/lightcurve/cadence.js";
import { computePeriodogram } from "../src/periodogram/periodogram.js";
import { childSeed, createRng } from "../src/random/rng.js";
import { rankOfTruth, rankUniformity } from "./samplers-calibration.js";
import { quasiPeriodicLikelihood } from "./samplers-gp-models.js";

/** The prior the calibration draws from and fits with: period, decayTime (days), harmonicWeight, sigma, mean (relative flux). */
export function rotationCalibrationSpace(): ParameterSpace {
  return createParameterSpace([
    { name: "period", prior: logUniformPrior(2, 15) },
    { name: "decayTime", prior: logUniformPrior(4, 150) },
    { name: "harmonicWeight", prior: uniformPrior(0, 0.5) },
    { name: "sigma", prior: logUniformPrior(0.01, 0.05) },
    { name: "mean", prior: normalPrior(1, 0.02) },
  ]);
}

const replicates = Number(process.argv[2] ?? 100);
const seed = Number(process.argv[3] ?? 41);
const sampler = (process.argv[4] ?? "fit") as SamplerKind | "fit";
const drawsPerRank = 99;
const bins = 10;
const errorLevel = 0.004;
const started = performance.now();
const space = rotationCalibrationSpace();
const names = space.free.map((p) => p.name);
const ranks: number[][] = names.map(() => []);
let converged = 0;
const methods: Record<string, number> = {};
for (let r = 0; r < replicates; r++) {
  const rng = createRng(childSeed(seed, r));
  const truth = space.toPhysical(space.drawFromPrior(rng));
  const [period, decayTime, harmonicWeight, sigma, mean] = truth;
  // 90 days, an exposure every 12 hours, a day lost every 13.7 days: about 170 points, at least 6 cycles.
  const time = continuousSpaceCadence({ start: 0, duration: 90, interval: 0.5, gapEvery: 13.7 }, rng);
  const kernel = kernels.quasiPeriodic({ sigma: sigma!, period: period!, decayTime: decayTime!, harmonicWeight: harmonicWeight! });
  const latent = new GaussianProcess(kernel, time, { mean: mean! }).priorDraw(rng);
  const error = Float64Array.from(time, () => errorLevel);
  const value = Float64Array.from(latent, (v, i) => v + error[i] * rng.normal());
  const peaks = computePeriodogram({ time, value, error }, { minimumFrequency: 1 / 15, maximumFrequency: 1 / 2, peaks: SEARCHED_PEAKS }).peaks.map((p) => p.period);
  const guess = peaks[0] ?? 5;
  const initial = { period: guess, decayTime: Math.min(3 * guess, 140), harmonicWeight: 0.25, sigma: 0.02, mean: 1 };
  const replicateSeed = childSeed(seed, 100000 + r);
  let draws: PosteriorDraws;
  let fitConverged: boolean;
  let stopReason: string;
  if (sampler === "fit") {
    const lightCurve: LightCurve = { time, value, error, unit: "flux", provenance: { source: `replicate ${r}`, timeColumn: "t", valueColumn: "f", errorColumn: "e", dropped: 0, sorted: false } };
    const fit = fitPathDraws(lightCurve, guess, peaks.slice(1), initial, replicateSeed);
    ({ draws, converged: fitConverged, stopReason } = fit);
    methods[fit.method] = (methods[fit.method] ?? 0) + 1;
  } else {
    const fit = samplePosterior(space, quasiPeriodicLikelihood(time, value, error), { seed: replicateSeed, sampler, initial, maxEvaluations: 2e6 });
    draws = posteriorDraws(space, fit.run);
    fitConverged = fit.diagnostics.converged;
    stopReason = fit.stopReason;
    methods[sampler] = (methods[sampler] ?? 0) + 1;
  }
  if (fitConverged) converged++;
  if (draws.chain.length < drawsPerRank) throw new Error(`replicate ${r}: the fit kept ${draws.chain.length} draws (${stopReason})`);
  names.forEach((name, i) => ranks[i].push(rankOfTruth(draws.columns[name], truth[i], drawsPerRank)));
  if (!fitConverged) console.error(`replicate ${r + 1}: not converged (${stopReason})`);
  // The figures so far every 10 replicates (stderr), so that a long run can be read before it ends.
  if ((r + 1) % 10 === 0 && r + 1 < replicates) report(r + 1, console.error);
}
process.exitCode = report(replicates, console.log) ? 0 : 1;

/** Prints the histograms and p-values of the first `done` replicates; true when every p-value passes. */
function report(done: number, print: (line: string) => void): boolean {
  const { histograms, pValues } = rankUniformity(ranks, drawsPerRank, bins);
  print(`simulation-based calibration, quasi-periodic rotation model, ${sampler}, ${done} of ${replicates} replicates, seed ${seed}`);
  print(`converged fits: ${converged}/${done}; by method: ${Object.entries(methods).map(([m, n]) => `${m} ${n}`).join(", ")}; ranks among ${drawsPerRank} draws, ${bins} bins`);
  const threshold = 0.01 / names.length;
  names.forEach((name, i) => {
    print(`${name.padEnd(15)} histogram ${histograms[i].map((c) => String(c).padStart(3)).join(" ")}  chi-square p = ${pValues[i].toFixed(3)}`);
  });
  const passed = pValues.every((p) => p >= threshold);
  print(`${((performance.now() - started) / 1000).toFixed(0)} s; ${passed ? "passed" : "FAILED"} (every p >= ${threshold.toFixed(4)})`);
  return passed;
}

/**
 * One replicate along the path of a quasi-periodic fit (models/fit-light-curve.ts: modes, sampling,
 * pooling, mean restoration) with the calibration priors in place of the data-driven ones, in the
 * model's parameter order (sigma, period, decayTime, harmonicWeight, mean), and the calibration's first
 * guess (inside those priors) for the mode search.
 */
function fitPathDraws(lightCurve: LightCurve, guess: number, otherPeaks: readonly number[], initial: Readonly<Record<string, number>>, fitSeed: string) {
  const built = buildModel("quasi-periodic", summarizeLightCurve(lightCurve), { periodGuess: guess, periodRange: { shortest: 2, longest: 15 } });
  const byName = new Map(space.free.map((p) => [p.name, p.prior]));
  const fitSpace = createParameterSpace(built.space.names.map((name) => ({ name, prior: byName.get(name)! })));
  const model = { ...built, space: fitSpace, initialGuess: initial };
  const likelihood = modelLikelihood(model, lightCurve);
  const plan = planModes(model, likelihood, guess, lightCurve.time, otherPeaks);
  const clock = () => performance.now();
  const { runs, weights, collapsed } = sampleStarts(model, lightCurve, likelihood, plan, { model: "quasi-periodic", seed: fitSeed, maxEvaluations: 2e6 }, clock);
  const pooled = pooledDraws(runs.map((run) => run.draws), weights);
  const { draws } = restoredPosterior(model, collapsed, pooled, runs[0].maximum, fitSeed);
  const diagnostics = combinedDiagnostics(runs, 0);
  return { draws, converged: diagnostics.converged, method: diagnostics.method, stopReason: diagnostics.stopReason };
}
