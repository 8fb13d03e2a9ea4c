import { UsageError } from "../errors/usage-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { textOption, type VerbArguments } from "./verb-arguments.js";

/**
 * How a verb treats the bands of its input, one rule for fit, predict, report, batch and compare:
 * - one band in the file (or no band column), or `--band NAME`: that band on its own ("single");
 * - several bands: each band on its own ("separate", the default of the command-line contract in
 *   docs/architecture.md), or with `--bands joint` one shared process fitted to all of them ("joint").
 * `--lags` and `--reference-band` belong to the joint model and ask for it.
 */
export type BandChoice =
  | { readonly kind: "single" }
  | { readonly kind: "joint"; readonly lags: boolean; readonly referenceBand?: string }
  | { readonly kind: "separate" };

/** The options of the rule. */
export const BAND_OPTIONS = {
  bands: { type: "string" },
  lags: { type: "boolean" },
  "reference-band": { type: "string" },
} as const;

/** The help lines of the rule. */
export const BAND_HELP = `Several bands (a band column, recognised by name or given by --band-col):
  by default each band is fitted on its own, in one JSON object {"perBand": {"<band>": result}};
  with --bands joint one shared process is fitted to every band at once, with an amplitude and a
  mean per band (JSON names amplitude.<band>, mean.<band>), also one JSON object; --robust fits
  one band at a time and does not go with it.
  --bands joint|separate  one shared process, or each band on its own (default)
  --band NAME             only this band
  --lags                  joint (implied): also a lag per band relative to the reference band (lag.<band>)
  --reference-band NAME   joint (implied): the band with amplitude 1 and lag 0 (default: the most points)`;

/** The band rule of a catalogue, whose objects differ in their bands: the options checked, each object's fit applies them (`fitBands`). */
export interface CatalogueBandRule {
  readonly bands?: "joint" | "separate";
  readonly lags?: true;
  readonly referenceBand?: string;
}

/**
 * The band options of `batch`, checked as far as they can be before any object is read: `--bands` is
 * joint or separate, and `--lags` / `--reference-band` do not go with `--bands separate`. An object with
 * one band is fitted on its own whatever they say; a reference band an object lacks fails that object.
 */
export function catalogueBandRule(values: VerbArguments["values"]): CatalogueBandRule {
  const bands = textOption(values, "bands");
  if (bands !== undefined && bands !== "joint" && bands !== "separate")
    throw new UsageError(`--bands must be joint or separate, got "${bands}"`);
  const lags = values.lags === true;
  const referenceBand = textOption(values, "reference-band");
  if ((lags || referenceBand !== undefined) && bands === "separate")
    throw new UsageError(`--${lags ? "lags" : "reference-band"} needs the joint model of several bands, not --bands separate`);
  if (bands === "joint" || lags || referenceBand !== undefined) refuseRobustJoint(values);
  return { ...(bands !== undefined ? { bands } : {}), ...(lags ? { lags: true } : {}), ...(referenceBand !== undefined ? { referenceBand } : {}) };
}

/** The robust (Student-t) noise is a model of one band's points: the joint model has none, so the two do not go together. */
function refuseRobustJoint(values: VerbArguments["values"]): void {
  if (values.robust === true)
    throw new UsageError("--robust fits one band at a time (the joint model of several bands has no robust noise): use --bands separate or --band NAME");
}

/** The band rule for these light curves and options (usage errors for options that do not apply). */
export function bandChoice(values: VerbArguments["values"], lightCurves: readonly LightCurve[]): BandChoice {
  const bands = textOption(values, "bands");
  if (bands !== undefined && bands !== "joint" && bands !== "separate")
    throw new UsageError(`--bands must be joint or separate, got "${bands}"`);
  const lags = values.lags === true;
  const referenceBand = textOption(values, "reference-band");
  const single = lightCurves.length === 1;
  if ((lags || referenceBand !== undefined) && (single || bands === "separate"))
    throw new UsageError(`--${lags ? "lags" : "reference-band"} needs the joint model of several bands${single ? " (the input has one band)" : ""}`);
  if (referenceBand !== undefined && !lightCurves.some((lc) => lc.band === referenceBand))
    throw new UsageError(`--reference-band ${referenceBand}: no such band (bands: ${lightCurves.map((lc) => lc.band).join(", ")})`);
  if (single) return { kind: "single" };
  if (bands !== "joint" && !lags && referenceBand === undefined) return { kind: "separate" };
  refuseRobustJoint(values);
  return { kind: "joint", lags, ...(referenceBand !== undefined ? { referenceBand } : {}) };
}
