import type { ParameterDisplay, ReportInput } from "./report-input.js";
import { pooledDraws } from "./pooled-draws.js";
import { sortedQuantile } from "../numerics/order-statistics.js";

/** Which kind of unit a parameter carries, so a default unit can be filled in from the data. */
type UnitKind = "time" | "value" | "none";

const KNOWN: Readonly<Record<string, { label: string; kind: UnitKind; description: string }>> = {
  tau: { label: "τ", kind: "time", description: "damping timescale" },
  sigma: { label: "σ", kind: "value", description: "variability amplitude" },
  mean: { label: "mean", kind: "value", description: "mean level" },
  period: { label: "P", kind: "time", description: "period" },
  quality: { label: "Q", kind: "none", description: "quality factor" },
  decayTime: { label: "τ_decay", kind: "time", description: "decay time" },
  harmonicWeight: { label: "harmonic weight", kind: "none", description: "weight of the first harmonic" },
  backgroundTau: { label: "τ_bg", kind: "time", description: "background timescale" },
  backgroundSigma: { label: "σ_bg", kind: "value", description: "background amplitude" },
  jitter: { label: "jitter", kind: "value", description: "excess white noise" },
};

/** Derived quantities of the models and the kind of their unit. */
const DERIVED_KINDS: Readonly<Record<string, UnitKind>> = {
  sfInf: "value",
  tauRest: "time",
  coherenceTime: "time",
  dominantPeriod: "time",
  quality: "none",
};

/**
 * The unit of a model parameter or derived quantity: the time unit for timescales and periods, the value
 * unit for amplitudes and levels, "" for dimensionless ones or names it does not know. Lags (`lag.<band>`)
 * are times; per-band means are values, per-band amplitudes ratios.
 *
 * @example parameterUnit("tau", "mag", "d") // "d"
 */
export function parameterUnit(name: string, valueUnit: string, timeUnit: string): string {
  const base = name.split(".")[0];
  const kind = KNOWN[name]?.kind ?? DERIVED_KINDS[name] ?? (base === "lag" ? "time" : base === "mean" ? "value" : "none");
  return kind === "time" ? timeUnit : kind === "value" ? valueUnit : "";
}

/**
 * A positive parameter whose central 99% of draws spans more than this factor (a decade) is drawn on a log axis:
 * on a linear axis such a posterior is a spike against a wall (common practice).
 */
const LOG_AXIS_SPAN = 10;

/** The unit text of the light curve's values: "mag" for magnitudes, "flux" (arbitrary units) otherwise. */
export function valueUnitOf(input: ReportInput): string {
  return input.lightCurve.unit === "mag" ? "mag" : "flux";
}

/** The time unit text of the report (default "d", the usual unit of astronomical time stamps). */
export function timeUnitOf(input: ReportInput): string {
  return input.timeUnit ?? "d";
}

/**
 * The display of a parameter: defaults for the model parameters named in docs/architecture.md ("Result JSON"; units taken from
 * the light curve and the time unit), overridden by `input.parameterDisplay`. When `logScale` is not
 * given, it is chosen from the spread of the draws.
 *
 * @example parameterDisplay(input, "tau") // { label: "τ", unit: "d", description: "damping timescale", logScale: false }
 */
export function parameterDisplay(input: ReportInput, name: string): ParameterDisplay {
  const known = KNOWN[name];
  const unit = parameterUnit(name, valueUnitOf(input), timeUnitOf(input));
  const override = input.parameterDisplay?.[name] ?? {};
  const label = override.label ?? known?.label ?? name;
  const description = override.description ?? known?.description;
  const logScale = override.logScale ?? spansDecades(input, name);
  return { label, unit: override.unit ?? unit, logScale, ...(description === undefined ? {} : { description }) };
}

/** The axis title of a parameter: "τ [d]", or "log₁₀ τ [d]" on a log axis, or just "Q" when dimensionless. */
export function parameterAxisTitle(display: ParameterDisplay): string {
  const base = display.logScale ? `log₁₀ ${display.label}` : display.label;
  return display.unit === "" ? base : `${base} [${display.unit}]`;
}

function spansDecades(input: ReportInput, name: string): boolean {
  if (input.draws.chains[name] === undefined) return false;
  const sorted = pooledDraws(input.draws, name).sort();
  if (sorted.length === 0 || sorted[0] <= 0) return false;
  const low = sortedQuantile(sorted, 0.005);
  const high = sortedQuantile(sorted, 0.995);
  return high / low > LOG_AXIS_SPAN;
}
