import type { FitResult } from "../models/fit-result.js";

/** A cell of the results table: text, a number (NaN and infinities allowed), a flag, or empty. */
export type ResultCell = string | number | boolean | null;

/** One object's line of the results table: column name to cell, in column order. */
export type ResultRow = Readonly<Record<string, ResultCell>>;

/** Whether an object's fit produced a result ("ok") or not ("failed", with a reason). */
export type ObjectStatus = "ok" | "failed";

/** The columns every row has, whatever happened to the object, in this order. */
export const LEADING_COLUMNS = ["object_id", "status", "reason", "model", "seed"] as const;

/** Columns that always hold text, even when every value looks like a number (for example object ids). */
export const TEXT_COLUMNS: ReadonlySet<string> = new Set(["object_id", "status", "reason", "model", "warnings"]);

/** Cells of `data` in the fit JSON that are copied to `data.<key>` columns. */
const DATA_KEYS = ["n", "dropped", "baseline", "medianCadence"] as const;

/**
 * Flattens a fit result to one row: the leading columns, `data.<key>` for the size of the light curve,
 * `<parameter>.<statistic>` for every number of every parameter summary (for example `tau.median`,
 * `tau.q2.5`; an interval [lower, upper] such as `hdi95` gives `tau.hdi95.lower` and `.upper`), the
 * same for the summaries of derived quantities when the fit reports them (`derived`, for example
 * `sfInf.median`), `diagnostics.<key>` for every scalar diagnostic, and `warnings` as a JSON array.
 *
 * @example okRow("quasar-0001", 123, fit)["tau.median"] === fit.parameters.tau.median
 */
export function okRow(objectId: string, seed: number, fit: FitResult): ResultRow {
  const row: Record<string, ResultCell> = {
    object_id: objectId,
    status: "ok",
    reason: null,
    model: fit.model,
    seed,
  };
  addFitColumns(row, fit, "");
  row.warnings = JSON.stringify(fit.warnings.map(singleLine));
  return row;
}

/**
 * The row of an object whose bands were fitted each on its own: the leading columns (the model of the
 * first band), then every column of {@link okRow} for each band with the band's name after the
 * parameter or key (`tau.g.median`, `data.n.g`, `diagnostics.converged.g`), `diagnostics.converged`
 * true when every band's fit converged, and the warnings of all bands, each prefixed by its band.
 *
 * @example perBandRow("lf-0001", 7, { g: fitG, r: fitR })["tau.r.median"] === fitR.parameters.tau.median
 */
export function perBandRow(objectId: string, seed: number, perBand: Readonly<Record<string, FitResult>>): ResultRow {
  const fits = Object.entries(perBand);
  const row: Record<string, ResultCell> = { object_id: objectId, status: "ok", reason: null, model: fits[0]?.[1].model ?? null, seed };
  const warnings: string[] = [];
  for (const [band, fit] of fits) {
    addFitColumns(row, fit, `.${band}`);
    for (const w of fit.warnings) warnings.push(`${band}: ${singleLine(w)}`);
  }
  row["diagnostics.converged"] = fits.every(([, fit]) => fit.diagnostics.converged);
  row.warnings = JSON.stringify(warnings);
  return row;
}

/** The data, summary and diagnostics cells of a fit, `suffix` after each parameter or key ("" or ".<band>"). */
function addFitColumns(row: Record<string, ResultCell>, fit: FitResult, suffix: string): void {
  for (const key of DATA_KEYS) row[`data.${key}${suffix}`] = fit.data[key];
  for (const [name, summary] of [...Object.entries(fit.parameters), ...Object.entries(fit.derived)]) {
    for (const [statistic, value] of Object.entries(summary)) {
      if (typeof value === "number") row[`${name}${suffix}.${statistic}`] = value;
      else if (isInterval(value)) {
        row[`${name}${suffix}.${statistic}.lower`] = value[0];
        row[`${name}${suffix}.${statistic}.upper`] = value[1];
      }
    }
  }
  for (const [key, value] of Object.entries(fit.diagnostics)) {
    if (typeof value === "number" || typeof value === "boolean" || typeof value === "string") row[`diagnostics.${key}${suffix}`] = value;
  }
}

/** The row of an object that could not be fitted: the leading columns, with the reason on one line. */
export function failedRow(objectId: string, seed: number, model: string, reason: string): ResultRow {
  return { object_id: objectId, status: "failed", reason: singleLine(reason), model, seed };
}

/** Replaces line breaks and tabs by spaces and trims, so a reason fits one CSV line and one log line. */
export function singleLine(text: string): string {
  return text.replace(/[\r\n\t]+/g, " ").trim();
}

function isInterval(value: unknown): value is [number, number] {
  return Array.isArray(value) && value.length === 2 && value.every((bound) => typeof bound === "number");
}

/**
 * The row with `extra` warnings placed before the fit's own in the `warnings` column (for example what
 * the reader said about the data). Returns the row unchanged when there is nothing to add.
 */
export function withWarnings(row: ResultRow, extra: readonly string[] | undefined): ResultRow {
  if (!extra || extra.length === 0 || row.status !== "ok") return row;
  const own = typeof row.warnings === "string" ? (JSON.parse(row.warnings) as string[]) : [];
  return { ...row, warnings: JSON.stringify([...extra.map(singleLine), ...own]) };
}
