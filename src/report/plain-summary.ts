import { convergenceFigure, formatMeasurement, formatSignificant } from "./format-measurement.js";
import { importanceFigures } from "../models/importance-figures.js";
import { parameterDisplay, timeUnitOf } from "./parameter-display.js";
import type { ReportInput } from "./report-input.js";

/**
 * Below this ratio of baseline to damping timescale, damped-random-walk timescales are biased
 * (Kozlowski 2017, A&A 597, A128: the baseline should be at least about ten times tau).
 */
export const DRW_BASELINE_RATIO = 10;

/**
 * The R-hat below which four chains are taken as mixed (Vehtari et al. 2021, Bayesian Analysis 16, 667);
 * fits with more chains report their own bound, `diagnostics.rhatThreshold`.
 */
export const RHAT_THRESHOLD = 1.01;

const MODEL_NAMES: Readonly<Record<string, string>> = {
  drw: "a damped random walk",
  oscillator: "a stochastically driven damped harmonic oscillator",
  "quasi-periodic": "a quasi-periodic model (damped oscillations at the period and half the period sharing one decay time)",
};

/**
 * A short plain-language account of what was measured, as sentences: the data, the model, the
 * headline parameters with medians and 68% credible intervals, and whether the sampler converged.
 *
 * @example plainSummary(input)[1] // "Fitted model: a damped random walk. The damping timescale τ is 310 +80/−60 d, ..."
 */
export function plainSummary(input: ReportInput): string[] {
  const { result, lightCurve } = input;
  const timeUnit = timeUnitOf(input);
  const sentences: string[] = [];

  const band = lightCurve.band === undefined ? "" : ` in band ${lightCurve.band}`;
  const placeholders = result.data.placeholders ?? 0;
  const missing = result.data.dropped - placeholders;
  const reasons = [
    ...(missing > 0 ? [`${missing} with a missing value`] : []),
    ...(placeholders > 0 ? [`${placeholders} with a placeholder code instead of a measurement`] : []),
  ];
  const dropped =
    result.data.dropped > 0
      ? ` ${result.data.dropped} ${result.data.dropped === 1 ? "row was" : "rows were"} dropped (${reasons.join(", ")}).`
      : "";
  // A joint fit of several bands: their counts, and which one the amplitudes and lags are relative to.
  const panels = input.bandPanels ?? [];
  const joint = panels.length > 1;
  const subject = joint
    ? `The ${panels.length} bands have ${result.data.n} measurements together (${panels.map((p) => `${p.lightCurve.time.length} in ${p.band}`).join(", ")})`
    : `The light curve${band} has ${result.data.n} measurements`;
  const lagged = Object.keys(result.parameters).some((name) => name.startsWith("lag."));
  const reference = joint ? ` The amplitudes${lagged ? " and lags" : ""} are relative to band ${lightCurve.band ?? panels[0].band}.` : "";
  sentences.push(
    `${subject} over a baseline of ` +
      `${formatSignificant(result.data.baseline)} ${timeUnit}, with a median spacing of ${formatSignificant(result.data.medianCadence)} ${timeUnit}.` +
      reference +
      dropped +
      (result.data.errorColumn === null ? " The file gives no errors, so a white-noise term was fitted." : ""),
  );

  const headline = headlineParameters(result.model);
  const described = headline.filter((name) => result.parameters[name] !== undefined).map((name) => describe(input, name));
  const modelName = MODEL_NAMES[result.model] ?? `the "${result.model}" model`;
  sentences.push(
    `Fitted model: ${modelName}.` +
      (described.length > 0 ? ` ${capitalise(joinList(described))} (posterior medians with 68% credible intervals).` : ""),
  );

  const tau = result.parameters["tau"];
  if (result.model === "drw" && tau !== undefined && tau.median > 0) {
    const ratio = result.data.baseline / tau.median;
    sentences.push(
      `The baseline is ${formatSignificant(ratio, 2)} times the timescale` +
        (ratio < DRW_BASELINE_RATIO
          ? `, short of the ${DRW_BASELINE_RATIO} times needed for an unbiased estimate, so the timescale may be underestimated.`
          : `, long enough for an unbiased estimate of it.`),
    );
  }
  for (const sentence of rotationSentences(input)) sentences.push(sentence);
  const quality = result.parameters["quality"];
  if (result.model === "oscillator" && quality !== undefined && quality.median < 0.5) {
    sentences.push("The quality factor is below 1/2: the variability is overdamped and shows no preferred period.");
  }

  const others = Object.keys(result.parameters).filter((name) => !headline.includes(name));
  if (others.length > 0) sentences.push(`Other parameters: ${others.map((name) => describe(input, name, true)).join("; ")}.`);

  const d = result.diagnostics;
  sentences.push(
    d.converged
      ? d.method === "importance"
        ? `The posterior was computed by importance sampling, whose diagnostics hold: ${importanceFigures(d)}.`
        : `The sampler converged: the largest R-hat is ${convergenceFigure(d.rhatMax)} and the smallest effective sample size is ${convergenceFigure(d.essMin, 3)}.`
      : `The sampler did not converge (largest R-hat ${convergenceFigure(d.rhatMax)}, target below ${+(d.rhatThreshold ?? RHAT_THRESHOLD).toPrecision(5)}; smallest effective sample size ${convergenceFigure(d.essMin, 3)}): treat these numbers as provisional.`,
  );
  const w = result.warnings.length;
  if (w > 0) sentences.push(`There ${w === 1 ? "is 1 warning" : `are ${w} warnings`}; read ${w === 1 ? "it" : "them"} before using these numbers.`);
  return sentences;
}

/** The parameters a sentence about each model leads with, in order. */
function headlineParameters(model: string): string[] {
  if (model === "drw") return ["tau", "sigma"];
  if (model === "oscillator") return ["period", "quality", "sigma"];
  if (model === "quasi-periodic") return ["period", "decayTime", "sigma"];
  return [];
}

function describe(input: ReportInput, name: string, terse = false): string {
  const summary = input.result.parameters[name];
  const display = parameterDisplay(input, name);
  const value = formatMeasurement(summary.median, summary.median - summary.q16, summary.q84 - summary.median);
  const unit = display.unit === "" ? "" : ` ${display.unit}`;
  if (terse || display.description === undefined) return `${display.label} = ${value}${unit}`;
  return `the ${display.description} ${display.label} is ${value}${unit}`;
}

/**
 * For a quasi-periodic fit: how long the pattern stays coherent (the decay time, in rotations) and, when
 * the first harmonic carries most of the variance, that the light curve mostly repeats every P / 2 (the
 * fit's derived `dominantPeriod`).
 */
function rotationSentences(input: ReportInput): string[] {
  const { result } = input;
  const decay = result.parameters["decayTime"];
  const period = result.parameters["period"];
  if (result.model !== "quasi-periodic" || decay === undefined || period === undefined) return [];
  const unit = timeUnitOf(input);
  const coherence = formatMeasurement(decay.median, decay.median - decay.q16, decay.q84 - decay.median);
  const sentences = [
    `The pattern stays coherent for about ${coherence} ${unit} (the decay time), ` +
      `${formatSignificant(decay.median / period.median, 2)} periods, before it changes.`,
  ];
  const weight = result.parameters["harmonicWeight"];
  if (weight !== undefined && weight.median >= 0.5) {
    sentences.push(
      `Most of the variance is in the first harmonic: the light curve repeats mostly every P/2 = ` +
        `${formatSignificant(period.median / 2)} ${unit} (the dominant period).`,
    );
  }
  return sentences;
}

function joinList(items: string[]): string {
  return items.length <= 1 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
