import { MODEL_NAMES, modelParameterNames, type ModelName } from "../models/light-curve-model.js";
import { LEADING_COLUMNS, type ResultRow } from "./result-row.js";

/**
 * The statistics of each parameter summary in the fit JSON: those of docs/architecture.md ("Result JSON"),
 * and the 95% highest-density interval that models/fit-light-curve.ts adds.
 */
export const SUMMARY_STATISTICS = ["median", "mean", "sd", "q2.5", "q16", "q84", "q97.5", "hdi95.lower", "hdi95.upper"] as const;

/** The diagnostics of the fit JSON (docs/architecture.md, "Result JSON"). */
export const DIAGNOSTIC_KEYS = [
  "converged",
  "rhatMax",
  "rhatThreshold",
  "essMin",
  "autocorrelationTime",
  "acceptance",
  "likelihoodEvaluations",
  "seconds",
] as const;

/**
 * The columns a results table is expected to have for a model, in order, from the fit-result contract:
 * the leading columns, `data.*`, every statistic of every parameter (with the background parameters when
 * a background is fitted, and `jitter`, which a fit adds when a light curve has no error column), the
 * diagnostics and the warnings. A fit that reports more is not truncated: the table grows by the union
 * of the columns actually seen (see {@link unionColumns}).
 */
export function expectedColumns(model: string, background: string | undefined): string[] {
  const parameters = (MODEL_NAMES as readonly string[]).includes(model) ? modelParameterNames(model as ModelName) : [];
  if (background) parameters.push("backgroundTau", "backgroundSigma");
  parameters.push("jitter");
  return [
    ...LEADING_COLUMNS,
    "data.n",
    "data.dropped",
    "data.baseline",
    "data.medianCadence",
    ...parameters.flatMap((name) => SUMMARY_STATISTICS.map((statistic) => `${name}.${statistic}`)),
    ...DIAGNOSTIC_KEYS.map((key) => `diagnostics.${key}`),
    "warnings",
  ];
}

/**
 * The columns `base` followed by those of `row` that `base` lacks, in the order they appear in the row.
 * Returns `base` itself when nothing is new, so callers can test `result !== base`.
 */
export function unionColumns(base: readonly string[], row: ResultRow): readonly string[] {
  let extra: string[] | undefined;
  const known = new Set(base);
  for (const column of Object.keys(row)) {
    if (!known.has(column)) {
      (extra ??= []).push(column);
      known.add(column);
    }
  }
  return extra ? [...base, ...extra] : base;
}

/**
 * Orders table columns by kind, keeping the order within each kind: the leading columns, `data.*`,
 * the summaries (parameters, then derived quantities, as first seen), `diagnostics.*`, then
 * `warnings`. Columns found only in later rows thus join their own group instead of trailing after
 * the warnings.
 */
export function orderColumns(columns: readonly string[]): string[] {
  const leading = new Set<string>(LEADING_COLUMNS);
  const rank = (column: string): number =>
    leading.has(column)
      ? 0
      : column.startsWith("data.")
        ? 1
        : column.startsWith("diagnostics.")
          ? 3
          : column === "warnings"
            ? 4
            : 2;
  const first = LEADING_COLUMNS.filter((column) => columns.includes(column));
  const rest = columns.filter((column) => !leading.has(column));
  return [...first, ...rest.map((column, index) => ({ column, index })).sort((a, b) => rank(a.column) - rank(b.column) || a.index - b.index).map(({ column }) => column)];
}
