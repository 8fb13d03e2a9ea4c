/* md
# A rotation period: the periodogram against the Gaussian-process posterior

Dark spots on a star's surface rotate in and out of view, so a spotted star brightens and fades with its
rotation period. But spots are born, drift and decay within weeks, so the signal is only *quasi*-periodic:
its phase and amplitude wander. And a star with spot groups on opposite hemispheres dims twice per rotation, so half
the period is as visible as the period itself. This notebook measures the rotation period of an invented
K dwarf of the Lanternfield Deep Survey, **LDS V-1187**, in two ways:

- the generalised Lomb-Scargle periodogram (Zechmeister & Kurster 2009, A&A 496, 577), which fits one
  strict sinusoid at every trial frequency, and
- a Gaussian process with the quasi-periodic rotation kernel, sampled for a posterior of the period,
  the coherence (spot-evolution) time and the harmonic content.

Then it repeats the cheap parts for forty stars like it, to see how often each method names the right
period. The stars are invented: their light curves are drawn from the rotation kernel with a known
period, so we can tell right answers from wrong ones.
*/
// The public entry point, as a user of the package writes `from "horologium"`.
import {
  buildModel, childSeed, compareModels, computePeriodogram, createRng, fitLightCurveDetailed, GaussianProcess, kernels,
  modelLikelihood, posteriorPredictive, seasonalGroundCadence, summarizeLightCurve, type LightCurve, type Rng,
} from "../src/index.js";
// Not (yet) in the public entry point:
import { observeMagnitudes } from "../src/lightcurve/simulated-photometry.js";
import { findPeriodModes } from "../src/models/period-modes.js";
import { storedPosteriorSample } from "../src/models/posterior-sample.js";
import { formatMeasurement } from "../src/report/format-measurement.js";
import { figure, table } from "./kit/notebook-output.js";
import { COLORS, jointDraw, plotSpec, quantile, timeGrid } from "./kit/plot.js";

/* md
## The invented star and its season of data

One 150-night observing season, a visit planned every night, 30% lost to weather, each within ±3 h of
midnight. The single-visit 5σ depth is r = 21.5 mag, so the errors at r ≈ 16.2 are about 6 mmag
(Ivezic et al. 2019, eqs. 4-5; close to the 5 mmag systematic floor).

The truth: the quasi-periodic kernel (damped oscillations at P and P/2 that share one decay time; see
`docs/choosing-a-kernel.md`) with P = 9.4 d; a decay time of 36 d (the spot pattern lasts about four
rotations); 60% of the variance in the first harmonic (two spot groups on opposite hemispheres), so the
light curve mostly repeats every P/2 = 4.7 d, the *dominant* period; amplitude σ = 15 mmag.
*/
const MJD0 = 60000;
const truth = { period: 9.4, decayTime: 36, harmonicWeight: 0.6, sigma: 0.015, mean: 16.2 };
const kernel = kernels.quasiPeriodic({ sigma: truth.sigma, period: truth.period, decayTime: truth.decayTime, harmonicWeight: truth.harmonicWeight });
const observingSeason = (rng: Rng) => seasonalGroundCadence({ start: 60420, seasons: 1, seasonLength: 150, revisitInterval: 1 }, rng);
const depth = { depth5Sigma: 21.5 };

const rng = createRng("lds-v-1187");
const time = observingSeason(rng);
const grid = timeGrid(time[0] - 2, time[time.length - 1] + 2, 800);
const latent = jointDraw(kernel, truth.mean, time, grid, rng);
const star = observeMagnitudes(time, latent.atObserved, depth, rng, "LDS V-1187 (invented)");
const baseline = star.time[star.time.length - 1] - star.time[0];
console.log(`${star.time.length} visits over ${baseline.toFixed(0)} d; median error ${(1000 * quantile(star.error!, 0.5)).toFixed(1)} mmag`);
console.log(`true decay time ${truth.decayTime} d = ${(truth.decayTime / truth.period).toFixed(1)} rotations`);

/* md
## The periodogram

We search periods from 1 d (a frequency of one cycle per day) up to half the season, on the default
grid of five points per peak width (VanderPlas 2018, ApJS 236, 16, sect. 7.1), and list the strongest
peaks with their search-wide false-alarm probabilities (Baluev 2008, MNRAS 385, 1279).
*/
const periodogram = computePeriodogram({ time: star.time, value: star.value, error: star.error! }, { minimumFrequency: 2 / baseline, maximumFrequency: 1, peaks: 5 });
const top = periodogram.peaks[0];
table(
  periodogram.peaks.map((p, k) => ({
    rank: k + 1,
    "period [d]": p.period.toFixed(3),
    "frequency [1/d]": p.frequency.toFixed(4),
    "period / true P": (p.period / truth.period).toFixed(3),
    power: p.power.toFixed(3),
    "false-alarm probability": p.falseAlarm < 1e-4 ? p.falseAlarm.toExponential(1) : p.falseAlarm.toFixed(4),
  })),
  "The strongest periodogram peaks (generalised Lomb-Scargle; Baluev 2008 false-alarm probabilities over the searched range).",
);
console.log(`highest peak: P = ${top.period.toFixed(2)} d = ${(top.period / truth.period).toFixed(2)} x the true period`);
console.log(`the 1-day alias of a frequency f lies at 1 - f: for the true P/2 that is a period of ${(1 / (1 - 2 / truth.period)).toFixed(2)} d`);

/* md
The peaks tell the usual story of a spotted star seen from the ground. The strongest power sits near
*half* the rotation period, because two spot groups make two dips per rotation; the peak is split,
because the spots' phase drifted during the season; and a peak near 1.2 to 1.3 d is the one-day alias of
the half period (nightly sampling cannot tell a frequency f from 1 − f). The false-alarm probabilities
say the variability is real. They do not say which peak is the rotation.

## The Gaussian-process posterior

`fitLightCurveDetailed` with `model: "quasi-periodic"` takes the periodogram's highest peak (searched
up to half the reciprocal of the smallest spacing) only as a first guess. It then maximises the posterior
from that period, half of it and twice it (the classic confusions of rotation periods), weighs the modes
it finds by their Laplace-approximated evidence, and samples every mode carrying more than 1% of the
probability. We use the (default) ensemble sampler with a budget of 10⁵ log-likelihood evaluations instead
of the default 2 × 10⁶, to keep the notebook short; any shortfall in convergence appears in the warnings
printed below.
*/
const fit = fitLightCurveDetailed(star, { model: "quasi-periodic", seed: 1187, sampler: "ensemble", maxEvaluations: 1e5 });
const { result } = fit;
const d = result.diagnostics;
console.log(`first guess from the periodogram: ${(result.periodogramPeriod as number).toFixed(2)} d`);
console.log(`period modes found: ${(result.periodModes as { period: number; probability: number }[]).map((m) => `${m.period.toFixed(2)} d (${(100 * m.probability).toFixed(1)}%)`).join(", ")}`);
console.log(`converged: ${d.converged} (stop: ${String(d.stopReason)}); largest R-hat ${d.rhatMax === null ? "none (importance sampling)" : d.rhatMax.toFixed(4)}; smallest ESS ${d.essMin.toFixed(0)}; ${d.seconds.toFixed(1)} s`);
console.log(result.warnings.length === 0 ? "no warnings" : result.warnings.join("\n"));

// %%
type Summary = { median: number; q16: number; q84: number; "q2.5": number; "q97.5": number };
const derived = result.derived as Record<string, Summary>;
const row = (quantity: string, s: Summary, unit: string, trueValue: number, digits = 3) => ({
  quantity,
  "posterior median ± 68%": `${formatMeasurement(s.median, s.median - s.q16, s.q84 - s.median)}${unit ? " " + unit : ""}`,
  "95% interval": `${s["q2.5"].toPrecision(digits)} to ${s["q97.5"].toPrecision(digits)}${unit ? " " + unit : ""}`,
  truth: `${trueValue}${unit ? " " + unit : ""}`,
});
const p = result.parameters;
table(
  [
    row("period P", p.period!, "d", truth.period),
    row("decay time", p.decayTime!, "d", truth.decayTime, 2),
    row("harmonic weight", p.harmonicWeight!, "", truth.harmonicWeight, 2),
    row("dominant period (P/2 when the harmonic weight is 1/2 or more)", derived.dominantPeriod!, "d", truth.harmonicWeight < 0.5 ? truth.period : truth.period / 2),
    row("quality of the fundamental √((π τ_decay / P)² + 1/4)", derived.quality!, "", Number(Math.sqrt((Math.PI * truth.decayTime / truth.period) ** 2 + 0.25).toFixed(1)), 2),
    row("σ", p.sigma!, "mag", truth.sigma, 2),
  ],
  "Posterior summaries of the rotation model beside the invented truth.",
);

/* md
## Side by side

The figure puts both answers on one period axis. The periodogram (grey, left axis) peaks where one
strict sinusoid fits best; the posterior density of the period (blue, right axis) is what the data say
about the rotation once spots may evolve and the light curve may have two dips per turn.
*/
const periodDraws = fit.draws.columns.period!;
const minP = 1;
const maxP = baseline / 2;
const bins = 120;
const edges = Array.from({ length: bins + 1 }, (_, k) => minP * Math.pow(maxP / minP, k / bins));
const counts = new Array<number>(bins).fill(0);
for (const value of periodDraws) {
  const k = Math.floor((Math.log(value / minP) / Math.log(maxP / minP)) * bins);
  if (k >= 0 && k < bins) counts[k]++;
}
// Density per unit ln P, so that the area under the bars on the log axis is one.
const densityRows = counts.map((c, k) => ({ p0: edges[k], p1: edges[k + 1], density: c / periodDraws.length / Math.log(edges[k + 1] / edges[k]) }));
const powerRows = Array.from(periodogram.frequency, (f, i) => ({ period: 1 / f, power: periodogram.power[i] })).filter((r) => r.period >= minP && r.period <= maxP);
const fap = periodogram.falseAlarmLevels.find((l) => l.probability === 0.01)!;
const periodAxis = { field: "period", type: "quantitative", title: "Period [d]", scale: { type: "log", domain: [minP, maxP], nice: false } };
// Label heights in pixels from the top of the plot, staggered so that neighbouring labels do not collide.
const markers = [
  { period: truth.period, label: `true P = ${truth.period} d`, color: COLORS.truth, ypx: 6 },
  { period: truth.period / 2, label: "true P / 2", color: COLORS.muted, ypx: 6 },
];
figure({
  id: "periodogram-vs-posterior",
  caption:
    "Generalised Lomb-Scargle power (grey line, left axis; dotted: the 1% search-wide false-alarm level) and the posterior " +
    `density of the period from the Gaussian process (blue bars, right axis, per unit ln P; ${periodDraws.length} draws). ` +
    "Dashed rules: the invented true period (orange) and half of it (grey).",
  spec: plotSpec({
    width: 760,
    height: 320,
    layer: [
      {
        layer: [
          { data: { values: powerRows }, mark: { type: "line", color: COLORS.periodogram, strokeWidth: 1.2, clip: true }, encoding: { x: periodAxis, y: { field: "power", type: "quantitative", title: "Lomb-Scargle power", scale: { domain: [0, Math.min(1, 1.35 * top.power)] } } } },
          { data: { values: [{ period: minP, power: fap.power }, { period: maxP, power: fap.power }] }, mark: { type: "line", strokeDash: [2, 3], color: COLORS.periodogram }, encoding: { x: periodAxis, y: { field: "power", type: "quantitative" } } },
          { data: { values: [{ period: maxP, power: fap.power, label: "1% false-alarm level" }] }, mark: { type: "text", align: "right", dx: -4, dy: -7, fontSize: 11, color: COLORS.periodogram }, encoding: { x: periodAxis, y: { field: "power", type: "quantitative" }, text: { field: "label" } } },
          { data: { values: markers }, mark: { type: "rule", strokeWidth: 1.2, strokeDash: [5, 3] }, encoding: { x: periodAxis, color: { field: "color", type: "nominal", scale: null } } },
          { data: { values: markers }, mark: { type: "text", align: "left", dx: 4, baseline: "top", fontSize: 11 }, encoding: { x: periodAxis, y: { field: "ypx", type: "quantitative", scale: null }, text: { field: "label" }, color: { field: "color", type: "nominal", scale: null } } },
        ],
      },
      {
        data: { values: densityRows },
        mark: { type: "rect", color: COLORS.model, opacity: 0.6 },
        encoding: {
          x: { ...periodAxis, field: "p0" },
          x2: { field: "p1" },
          y: { field: "density", type: "quantitative", title: ["Posterior density of the period", "[per unit ln P]"], scale: { domain: [0, 1.35 * Math.max(...densityRows.map((r) => r.density))] }, axis: { titleColor: COLORS.model, labelColor: COLORS.model } },
          y2: { datum: 0 },
        },
      },
    ],
    resolve: { scale: { y: "independent" } },
  }),
});

/* md
## Folding on each answer

Folding the light curve on a period stacks the rotations on top of each other. The spots change too much
over the season for a clean fold (the decay time is about a month), and single visits are noisy, so
we fold the first 40 nights only and draw, besides the measurements, the posterior-predictive mean of the
latent light curve, one line per cycle. On the posterior period the first cycles repeat one shape, with two
dips of different depth from the two spot groups, until the spots evolve and the shape drifts. On the
periodogram's half period consecutive cycles disagree in depth and phase from the start, which a true
period would not allow.
*/
const sample = storedPosteriorSample(result, fit.model.space.names);
const rows = sample.rows.filter((_, k) => k % Math.ceil(sample.rows.length / 80) === 0);
const predictive = posteriorPredictive(fit.model, star, rows, grid);
const FOLD_NIGHTS = 40;
const firstNight = star.time[0];
const phaseOf = (t: number, period: number) => ((((t - firstNight) / period) % 1) + 1) % 1;
const cycleOf = (t: number, period: number) => Math.floor((t - firstNight) / period) + 1;
const gpPanel = `posterior median P = ${p.period!.median.toFixed(2)} d`;
const pgPanel = `highest periodogram peak P = ${top.period.toFixed(2)} d`;
const foldPoints = (period: number, panel: string) =>
  Array.from(star.time, (t, i) => ({ t, phase: phaseOf(t, period), y: star.value[i], panel })).filter((r) => r.t >= firstNight && r.t < firstNight + FOLD_NIGHTS);
const foldCurves = (period: number, panel: string) =>
  Array.from(grid, (t, i) => ({ t, phase: phaseOf(t, period), cycle: cycleOf(t, period), m: predictive.mean[i], panel }))
    .filter((r) => r.t >= firstNight && r.t < firstNight + FOLD_NIGHTS)
    .sort((a, b) => a.cycle - b.cycle || a.phase - b.phase);
figure({
  id: "folded",
  caption:
    `The first ${FOLD_NIGHTS} nights folded on the posterior-median period (left) and on the period of the highest periodogram peak ` +
    "(right), phase 0 at the first visit. Points: the measurements; lines: the posterior-predictive mean of the latent light curve, " +
    "one per cycle, coloured by cycle number. Brighter is up.",
  spec: plotSpec({
    // One table for both panels (a facet needs its data at the top): each row is a measurement or a curve point.
    data: {
      values: [
        ...[...foldPoints(p.period!.median, gpPanel), ...foldPoints(top.period, pgPanel)].map((r) => ({ ...r, kind: "point" })),
        ...[...foldCurves(p.period!.median, gpPanel), ...foldCurves(top.period, pgPanel)].map((r) => ({ ...r, kind: "curve" })),
      ],
    },
    columns: 2,
    facet: { field: "panel", type: "nominal", title: null, sort: [gpPanel, pgPanel], header: { labelFontSize: 12 } },
    spec: {
      width: 340,
      height: 260,
      layer: [
        {
          transform: [{ filter: "datum.kind === 'curve'" }],
          mark: { type: "line", strokeWidth: 1.6, opacity: 0.9 },
          encoding: {
            x: { field: "phase", type: "quantitative", title: "Phase [cycles]", scale: { domain: [0, 1] } },
            y: { field: "m", type: "quantitative", title: "r magnitude [mag]", scale: { zero: false, reverse: true } },
            detail: { field: "cycle", type: "nominal" },
            color: { field: "cycle", type: "quantitative", title: "Cycle", scale: { scheme: "viridis" }, legend: { orient: "right", gradientLength: 200, titleLimit: 0 } },
          },
        },
        {
          transform: [{ filter: "datum.kind === 'point'" }],
          mark: { type: "circle", size: 18, color: COLORS.data, opacity: 0.7 },
          encoding: { x: { field: "phase", type: "quantitative" }, y: { field: "y", type: "quantitative" } },
        },
      ],
    },
  }),
});

// %%
const lcSeries = ["data ± 1σ", "true latent curve", "predictive mean", "95% band"];
const lcColors = { domain: lcSeries, range: [COLORS.data, COLORS.truth, COLORS.model, COLORS.modelBandOuter] };
figure({
  id: "light-curve",
  caption:
    `The season of LDS V-1187 (points, 1σ error bars), the posterior-predictive mean and 95% band of the rotation model from ${rows.length} ` +
    "posterior draws (blue), and the invented true curve (orange, dashed). Brighter is up; the band widens in the nights lost to weather.",
  spec: plotSpec({
    width: 760,
    height: 300,
    datasets: {
      band: Array.from(grid, (t, i) => ({ t: t - MJD0, m: predictive.mean[i], lo: predictive.lower95[i], hi: predictive.upper95[i], truth: latent.atGrid[i] })),
      points: Array.from(star.time, (t, i) => ({ t: t - MJD0, y: star.value[i], lo: star.value[i] - star.error![i], hi: star.value[i] + star.error![i] })),
    },
    encoding: { x: { field: "t", type: "quantitative", title: `Time [MJD − ${MJD0}, d]`, scale: { zero: false, nice: false } } },
    layer: [
      { data: { name: "band" }, mark: { type: "area" }, encoding: { y: { field: "lo", type: "quantitative", title: "r magnitude [mag]", scale: { zero: false, reverse: true } }, y2: { field: "hi" }, color: { datum: lcSeries[3], scale: lcColors, legend: { title: null, orient: "top", direction: "horizontal" } } } },
      { data: { name: "band" }, mark: { type: "line", strokeWidth: 1.4 }, encoding: { y: { field: "m", type: "quantitative" }, color: { datum: lcSeries[2] } } },
      { data: { name: "band" }, mark: { type: "line", strokeWidth: 1, strokeDash: [4, 3] }, encoding: { y: { field: "truth", type: "quantitative" }, color: { datum: lcSeries[1] } } },
      { data: { name: "points" }, mark: { type: "rule", strokeWidth: 0.8 }, encoding: { y: { field: "lo", type: "quantitative" }, y2: { field: "hi" }, color: { datum: lcSeries[0] } } },
      { data: { name: "points" }, mark: { type: "point", filled: true, size: 14 }, encoding: { y: { field: "y", type: "quantitative" }, color: { datum: lcSeries[0] } } },
    ],
  }),
});

/* md
## Forty stars like it

One star is an anecdote. Here are forty more with the same parameters, cadence and depth, each a new
draw of the process. For each we record the periodogram's highest peak (searched down to 1 d, as above)
and the most probable period mode of the Gaussian-process posterior. For the latter we run the mode
search that `fitLightCurveDetailed` runs before sampling (`buildModel`, then `findPeriodModes` from the
periodogram's highest peak below half the reciprocal of the smallest spacing), which takes a fraction of
a second; sampling forty posteriors would take minutes and would not move the modes.
*/
const STARS = 40;
interface Outcome {
  readonly periodogram: number;
  readonly gp: number;
  readonly gpProbability: number;
}
const outcomes: Outcome[] = [];
for (let k = 0; k < STARS; k++) {
  const r = createRng(childSeed("lds-rotation-population", k));
  const t = observingSeason(r);
  const lc: LightCurve = observeMagnitudes(t, new GaussianProcess(kernel, t, { mean: truth.mean }).priorDraw(r), depth, r, `rotation population ${k}`);
  const summary = summarizeLightCurve(lc);
  const series = { time: lc.time, value: lc.value, error: lc.error! };
  const wide = computePeriodogram(series, { minimumFrequency: 2 / summary.baseline, maximumFrequency: 1, peaks: 1 }).peaks[0];
  const guess = computePeriodogram(series, { minimumFrequency: 2 / summary.baseline, maximumFrequency: 1 / (2 * summary.minimumSpacing), peaks: 1 }).peaks[0];
  const model = buildModel("quasi-periodic", summary, { periodGuess: guess.period });
  const modes = findPeriodModes(model, modelLikelihood(model, lc), model.initialGuess.period!);
  outcomes.push({ periodogram: wide.period, gp: modes[0]?.period ?? NaN, gpProbability: modes[0]?.probability ?? NaN });
}
const classify = (period: number) => {
  const r = period / truth.period;
  if (Math.abs(r - 1) < 0.1) return "within 10% of P";
  if (Math.abs(r - 0.5) < 0.05) return "within 10% of P/2";
  if (period < 2) return "one-day alias";
  return "elsewhere";
};
const classes = ["within 10% of P", "within 10% of P/2", "one-day alias", "elsewhere"];
table(
  (["periodogram", "gp"] as const).map((method) => ({
    method: method === "periodogram" ? "highest periodogram peak" : "most probable posterior mode",
    ...Object.fromEntries(classes.map((c) => [c, String(outcomes.filter((o) => classify(o[method]) === c).length)])),
  })),
  `Which period each method names, for ${STARS} invented stars with true P = ${truth.period} d.`,
);
const confident = outcomes.filter((o) => o.gpProbability > 0.9);
console.log(`posterior modes with more than 90% of the probability: ${confident.length} of ${STARS}; of those, ${confident.filter((o) => classify(o.gp) === classes[0]).length} within 10% of P`);

// %%
const methods = ["highest periodogram peak", "most probable posterior mode"];
const stripRows = outcomes.flatMap((o) => [
  { method: methods[0], ratio: o.periodogram / truth.period },
  { method: methods[1], ratio: o.gp / truth.period },
]);
figure({
  id: "forty-stars",
  caption:
    `The period each method names, divided by the true period, for ${STARS} invented stars with identical parameters (one tick per star). ` +
    "Dashed rules: the true period (1) and half of it (0.5). Ticks near 0.13 are the one-day alias of the half period.",
  spec: plotSpec({
    width: 620,
    height: 130,
    layer: [
      { data: { values: [{ r: 1 }, { r: 0.5 }] }, mark: { type: "rule", strokeDash: [5, 4], color: COLORS.muted }, encoding: { x: { field: "r", type: "quantitative" } } },
      {
        data: { values: stripRows },
        mark: { type: "tick", thickness: 2, size: 30, opacity: 0.6 },
        encoding: {
          x: { field: "ratio", type: "quantitative", title: "Period named / true period", scale: { type: "log", domain: [0.1, 2.5], nice: false }, axis: { values: [0.1, 0.2, 0.5, 1, 2] } },
          y: { field: "method", type: "nominal", title: null, sort: methods, axis: { labelLimit: 0 } },
          color: { field: "method", type: "nominal", scale: { domain: methods, range: [COLORS.data, COLORS.model] }, legend: null },
        },
      },
    ],
  }),
});

/* md
## Is there a period at all?

A periodogram peak with a small false-alarm probability says the data are not white noise; it does not
say they are periodic rather than red noise, which also piles power at low frequencies. `compareModels`
asks the sharper question: how much more probable are the data under a rotation model than under an
aperiodic damped random walk, each integrated over its parameters and so charged for its extra freedom (the
Bayesian evidence, by importance sampling at the posterior's modes, or bridge sampling from MCMC draws where
that fails, each with its Monte Carlo error; read on the scale of Kass & Raftery 1995, JASA 90, 773).
*/
const comparison = compareModels(star, ["drw", "oscillator", "quasi-periodic"], { seed: 1187 });
table(
  comparison.ranking.map((s) => ({
    model: s.model,
    parameters: s.parameterCount,
    "ln evidence − best": s.deltaLogEvidence.toFixed(1),
    "± s.e., by": `${s.logEvidenceError === null ? "none" : s.logEvidenceError.toFixed(2)}, ${s.evidenceMethod}`,
    probability: s.probability < 1e-4 ? s.probability.toExponential(1) : s.probability.toFixed(4),
    "period at the maximum [d]": s.maximum.period !== undefined ? s.maximum.period.toFixed(2) : "—",
  })),
  "Models ranked by their evidence (its Monte Carlo error and estimator beside it), equal prior odds.",
);
console.log(comparison.verdict);

/* md
## What to take away

- The periodogram finds where the power is, fast, and the library uses it as exactly that: a first
  guess. For a spotted star with two spot groups, its highest peak is often half the rotation period or
  that half period's one-day alias (count them in the table above).
- The Gaussian-process posterior, with its search over P, P/2 and 2P, names the rotation period far more
  often, gives it an interval that accounts for spot evolution, and measures the evolution (the decay
  time) and the light curve's shape (the harmonic weight, and with it the dominant period) as well.
- Model comparison by evidence, not the false-alarm probability, is what tells periodic from red noise.
*/
