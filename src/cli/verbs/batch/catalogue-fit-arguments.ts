import { carmaOrderOf, orderText } from "../../../models/carma-model.js";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import type { ResultsFormat } from "../../../batch/batch-run.js";
import type { CatalogueReadOptions } from "../../../batch/catalogue-input.js";
import { UsageError } from "../../../errors/usage-error.js";
import type { ModelName } from "../../../models/light-curve-model.js";
import { BAND_OPTIONS, catalogueBandRule, type CatalogueBandRule } from "../../band-choice.js";
import type { CliIo } from "../../cli-io.js";
import { FIT_OPTIONS, fitArgumentList, fitArguments, type FitArguments } from "../../fit-arguments.js";
import { lightCurveReadOptions } from "../../read-input.js";
import { COLUMN_OPTIONS, numberOption, textOption, type VerbArguments } from "../../verb-arguments.js";

/** The options of `batch` and `batch plan` that say what to fit and how to read the catalogue. */
export const CATALOGUE_FIT_OPTIONS = {
  ...FIT_OPTIONS,
  ...COLUMN_OPTIONS,
  "id-col": { type: "string" },
  timeout: { type: "string" },
  "fit-module": { type: "string" },
  ...BAND_OPTIONS,
} as const;

/** The help lines of the catalogue options beyond those of every fit (FIT_HELP, COLUMN_HELP). */
export const CATALOGUE_HELP = `  --id-col NAME           the object-id column, when INPUT is one table
  --timeout SECONDS       give up on an object after this long (recorded as failed)
  --fit-module FILE       fit with fitLightCurve(lightCurve, options) exported by this ES module
                          instead of Horologium's own (for custom models; it must return a complete
                          fit result, docs/architecture.md)
Objects with several bands (a band column): each band on its own by default (columns <name>.<band>.*,
  for example tau.g.median), or with --bands joint one shared process (amplitude.<band>.*, mean.<band>.*,
  with --lags lag.<band>.*); --band NAME fits only that band of every object.
  --bands joint|separate  --lags  --reference-band NAME   as for fit`;

/** What to fit and how, validated: shared by the run and the plan. */
export interface CatalogueFitChoice {
  readonly fit: FitArguments & { readonly model: ModelName };
  readonly read: CatalogueReadOptions;
  readonly timeoutSeconds?: number;
  /** URL of the fit module, when one was given. */
  readonly fitModule?: string;
  /** The multi-band rule for objects with several bands. */
  readonly bandRule: CatalogueBandRule;
  /** The same choices as command-line arguments, for job scripts. */
  readonly arguments: readonly string[];
}

/**
 * Reads the fit options by the rules every fitting verb shares ({@link fitArguments}), the column options
 * by those of every reading verb ({@link lightCurveReadOptions}), and the catalogue's own.
 */
export function catalogueFitChoice(values: VerbArguments["values"], io: CliIo): CatalogueFitChoice {
  const fit = fitArguments(values, true);
  const idColumn = textOption(values, "id-col");
  const read: CatalogueReadOptions = { ...lightCurveReadOptions(values), ...(idColumn !== undefined ? { idColumn } : {}) };
  const timeoutSeconds = numberOption(values, "timeout");
  if (timeoutSeconds !== undefined && !(timeoutSeconds > 0)) throw new UsageError(`--timeout must be a positive number of seconds, got ${timeoutSeconds}`);
  const modulePath = textOption(values, "fit-module");
  const bandRule = catalogueBandRule(values);
  const list = fitArgumentList(fit);
  for (const name of ["id-col", ...Object.keys(COLUMN_OPTIONS), "timeout", ...Object.keys(BAND_OPTIONS)]) {
    const value = values[name];
    if (typeof value === "string") list.push(`--${name}`, value);
    else if (value === true) list.push(`--${name}`);
  }
  if (modulePath !== undefined) list.push("--fit-module", resolve(io.cwd, modulePath));
  return {
    fit,
    read,
    ...(timeoutSeconds !== undefined ? { timeoutSeconds } : {}),
    ...(modulePath !== undefined ? { fitModule: pathToFileURL(resolve(io.cwd, modulePath)).href } : {}),
    bandRule,
    arguments: list,
  };
}

/**
 * The fit options handed to every object's fit as they are (the model, background and seed go
 * separately); a CARMA order travels as its text "p,q" and is read back by the worker's fit.
 */
export function perObjectFitOptions(fit: FitArguments, bandRule: CatalogueBandRule = {}): Record<string, string | number | boolean> {
  const { model: _model, background: _background, seed: _seed, order, ...rest } = fit;
  return { ...rest, ...(order !== undefined ? { order: orderText(carmaOrderOf(order)) } : {}), ...bandRule };
}

/** The format of a results table from its file name. */
export function resultsFormatOf(path: string, option: string): ResultsFormat {
  if (/\.csv$/i.test(path)) return "csv";
  if (/\.parquet$/i.test(path)) return "parquet";
  throw new UsageError(`${option} ${path}: the results table must end in .csv or .parquet`);
}
