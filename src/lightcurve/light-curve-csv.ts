import type { LightCurve } from "./light-curve.js";

/**
 * Formatting a light curve as CSV text that the Horologium readers read back unchanged: columns
 * `time`, `mag`/`flux`, `mag_err`/`flux_err` (when there are errors) and `band` (when set). Pure:
 * usable in the browser, for example to offer a download.
 */

/** Options of {@link formatLightCurveCsv}. */
export interface LightCurveCsvOptions {
  /** Lines written before the header, each prefixed with "# " (for provenance: seed, model, parameters). */
  readonly comments?: readonly string[];
  /**
   * Significant digits of values and errors; default: the shortest text that reads back to the same
   * double (exact round trip). Times are always written exactly.
   */
  readonly digits?: number;
}

/**
 * Formats one or more light curves (for example one per band) as CSV. All light curves must share the
 * unit and the presence of errors; a band column is written when any has a band.
 *
 * @example formatLightCurveCsv(lc, { comments: ["simulated, seed 42"] })
 */
export function formatLightCurveCsv(lightCurves: LightCurve | readonly LightCurve[], options: LightCurveCsvOptions = {}): string {
  const list = Array.isArray(lightCurves) ? (lightCurves as readonly LightCurve[]) : [lightCurves as LightCurve];
  if (list.length === 0) throw new RangeError("no light curve to format");
  const unit = list[0].unit;
  const withErrors = list[0].error !== undefined;
  const withBand = list.some((lc) => lc.band !== undefined);
  for (const lc of list) {
    if (lc.unit !== unit) throw new RangeError("light curves in one CSV must share the unit");
    if ((lc.error !== undefined) !== withErrors) throw new RangeError("either every light curve has errors or none has");
    if (lc.time.length !== lc.value.length || (lc.error && lc.error.length !== lc.time.length)) {
      throw new RangeError("time, value and error arrays differ in length");
    }
  }
  const number = options.digits === undefined ? (x: number) => String(x) : (x: number) => Number(x.toPrecision(options.digits)).toString();
  const lines: string[] = (options.comments ?? []).map((c) => `# ${c.replace(/[\r\n]+/g, " ")}`);
  const header = ["time", withBand ? "band" : "", unit, withErrors ? `${unit}_err` : ""].filter((h) => h !== "");
  lines.push(header.join(","));
  for (const lc of list) {
    const band = withBand ? csvField(lc.band ?? "") : "";
    for (let i = 0; i < lc.time.length; i++) {
      const cells = [String(lc.time[i])];
      if (withBand) cells.push(band);
      cells.push(number(lc.value[i]));
      if (withErrors) cells.push(number(lc.error![i]));
      lines.push(cells.join(","));
    }
  }
  return lines.join("\n") + "\n";
}

function csvField(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
