import type { LightCurve } from "../lightcurve/light-curve.js";
import type { DataSummary } from "./data-summary.js";
import type { FitDiagnostics, ParameterSummary } from "./fit-result.js";
import type { LightCurveModel } from "./light-curve-model.js";
import type { DrawnPeriodMode } from "./period-modes.js";

/** What the warnings are drawn from. */
export interface WarningInputs {
  readonly model: Pick<LightCurveModel, "name" | "space">;
  readonly summary: DataSummary;
  readonly lightCurve: LightCurve;
  readonly parameters: Readonly<Record<string, ParameterSummary>>;
  readonly diagnostics: FitDiagnostics & { readonly stopReason?: string };
  /** The modes the posterior draws sit in, with their shares. */
  readonly modes: readonly DrawnPeriodMode[];
  /** Summaries of the derived quantities (`dominantPeriod` for rotation). */
  readonly derived?: Readonly<Record<string, ParameterSummary>>;
  readonly redshift?: number;
}

const fmt = (x: number) => (Math.abs(x) >= 1e4 || Math.abs(x) < 1e-2 ? x.toExponential(2) : x.toPrecision(3));
/** A time in the input unit, days for the trade's light curves (the unit every console line names). */
const days = (x: number) => `${fmt(x)} d`;

/**
 * A parameter's value with its unit: times (timescales, periods, decay times, lags) in days, amplitudes in the
 * light curve's unit, dimensionless ones bare.
 */
function withUnit(name: string, value: number, lightCurve: LightCurve): string {
  if (/tau|period|decay|lag|time/i.test(name)) return days(value);
  if (/sigma|jitter|amplitude/i.test(name)) return `${fmt(value)} ${lightCurve.unit}`;
  return fmt(value);
}

/**
 * Plain-language warnings about what the data do and do not constrain:
 * - the sampler did not converge (R-hat, ESS, budget);
 * - a damped-random-walk timescale longer than a tenth of the baseline is biased (Kozlowski 2017, A&A 597,
 *   A128), and one shorter than the median cadence is not resolved by the sampling;
 * - a posterior piled against a prior bound gives only a limit;
 * - the period posterior has several modes (aliases);
 * - rows were dropped or had to be sorted by time, or no error column was given and a white-noise term was fitted.
 */
export function fitWarnings(inputs: WarningInputs): string[] {
  const { model, summary, lightCurve, parameters, diagnostics, modes } = inputs;
  const warnings: string[] = [];
  // R-hat and the autocorrelation time are null for importance sampling (they do not apply), NaN when
  // an MCMC run kept too few draws to compute them.
  const notComputed = (value: number | null) => value !== null && !Number.isFinite(value);
  if (notComputed(diagnostics.rhatMax) || !Number.isFinite(diagnostics.essMin) || notComputed(diagnostics.autocorrelationTime)) {
    const kept = typeof diagnostics.keptDraws === "number" ? `only ${diagnostics.keptDraws} posterior draws were kept` : "too few posterior draws were kept";
    warnings.push(
      `The sampler stopped (${diagnostics.stopReason ?? "budget"}) before convergence and ${kept}, too few to compute ` +
        "R-hat and the effective sample size: convergence is unknown and the summaries are rough; raise the budget (--max-evaluations).",
    );
  } else if (!diagnostics.converged) {
    warnings.push(
      `The sampler stopped (${diagnostics.stopReason ?? "budget"}) before convergence: largest R-hat ${(diagnostics.rhatMax ?? NaN).toFixed(4)}, ` +
        `smallest ESS ${Math.round(diagnostics.essMin)}, autocorrelation time ${fmt(diagnostics.autocorrelationTime ?? NaN)} ` +
        `(targets: R-hat < ${+(diagnostics.rhatThreshold ?? 1.01).toPrecision(5)}, bulk and tail ESS >= 400, chains at least 50 autocorrelation times long); ` +
        "treat the intervals as rough or raise the budget.",
    );
  }
  if (model.name === "drw" && parameters.tau) {
    const tau = parameters.tau.median;
    if (summary.baseline < 10 * tau) {
      warnings.push(
        `The baseline (${days(summary.baseline)}) is shorter than 10 tau (tau = ${days(tau)}): damped-random-walk timescales ` +
          `this long relative to the baseline are biased (Kozlowski 2017, A&A 597, A128).`,
      );
    }
    if (tau < summary.medianCadence) {
      warnings.push(
        `tau (${days(tau)}) is shorter than the median cadence (${days(summary.medianCadence)}): the sampling does not resolve the timescale.`,
      );
    }
  }
  for (const p of model.space.free) {
    const s = parameters[p.name];
    if (!s || p.prior.family !== "log-uniform") continue;
    const logRange = Math.log(p.prior.upper / p.prior.lower);
    if (Math.log(p.prior.upper / s["q97.5"]) < 0.02 * logRange && Math.log(s["q2.5"] / p.prior.lower) > 0.1 * logRange) {
      warnings.push(`${p.name} runs into the upper end of its prior (${withUnit(p.name, p.prior.upper, lightCurve)}): the data give only a lower limit (${p.name} > ${withUnit(p.name, s["q2.5"], lightCurve)} with 97.5% probability).`);
    } else if (Math.log(s["q2.5"] / p.prior.lower) < 0.02 * logRange && Math.log(p.prior.upper / s["q97.5"]) > 0.1 * logRange) {
      warnings.push(`${p.name} runs into the lower end of its prior (${withUnit(p.name, p.prior.lower, lightCurve)}): the data give only an upper limit (${p.name} < ${withUnit(p.name, s["q97.5"], lightCurve)} with 97.5% probability).`);
    }
  }
  const significant = modes.filter((m) => m.probability >= 0.01);
  if (significant.length > 1) {
    const list = significant.map((m) => `${days(m.period)} (${(100 * m.probability).toFixed(0)}% of the draws)`).join(", ");
    warnings.push(
      `The data cannot decide between several periods: ${list}. The summaries pool them; quote the period with its modes ` +
        "(periodModes), not as one number.",
    );
  }
  const dominant = inputs.derived?.dominantPeriod;
  const period = parameters.period;
  if (dominant && period && Math.abs(dominant.median / period.median - 1) > 0.05) {
    warnings.push(
      `Most of the variance repeats every ${days(dominant.median)} (dominantPeriod, 95%: ${fmt(dominant["q2.5"])} to ${days(dominant["q97.5"])}), ` +
        `half the fitted period ${days(period.median)}: the harmonic carries more of the signal than the fundamental ` +
        `(harmonicWeight ${fmt(parameters.harmonicWeight?.median ?? NaN)}). Quote dominantPeriod as the photometric period; ` +
        "period is the repeat of the whole pattern, which the data may not distinguish from it.",
    );
  }
  const { dropped, placeholders = 0 } = lightCurve.provenance;
  if (dropped > 0) {
    const missing = dropped - placeholders;
    const parts = [
      ...(missing > 0 ? [`${missing} with missing values`] : []),
      ...(placeholders > 0 ? [`${placeholders} whose magnitude or error is a placeholder code (99, 99.99, -99, -999)`] : []),
    ];
    warnings.push(`${dropped} rows were dropped: ${parts.join(", ")}.`);
  }
  if (lightCurve.provenance.sorted) warnings.push("The rows of the file were not in time order; they were sorted by time before the fit.");
  if (!summary.hasErrors) {
    warnings.push("The light curve has no error column: a white-noise term (jitter) was fitted for the measurement errors.");
  }
  return warnings;
}
