import { resolve } from "node:path";
import { UsageError } from "../errors/usage-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { LightCurveReadOptions } from "../lightcurve/parse-light-curve-bytes.js";
import { readLightCurves } from "../lightcurve/read-light-curves.js";
import type { CliIo } from "./cli-io.js";
import { textOption, type VerbArguments } from "./verb-arguments.js";

/**
 * The reader options of the column options (COLUMN_OPTIONS), checked: `--error-col none` means no error
 * column, `--unit` is mag or flux, `--keep-placeholders` keeps rows with "no measurement" codes. Shared by every verb that reads light curves, the batch included.
 */
export function lightCurveReadOptions(values: VerbArguments["values"]): LightCurveReadOptions {
  const errorColumn = textOption(values, "error-col");
  const unit = textOption(values, "unit");
  if (unit !== undefined && unit !== "mag" && unit !== "flux") throw new UsageError(`--unit must be mag or flux, got "${unit}"`);
  return {
    ...optional("timeColumn", textOption(values, "time-col")),
    ...optional("valueColumn", textOption(values, "value-col")),
    ...(errorColumn !== undefined ? { errorColumn: errorColumn === "none" ? null : errorColumn } : {}),
    ...optional("bandColumn", textOption(values, "band-col")),
    ...optional("band", textOption(values, "band")),
    ...(unit !== undefined ? { unit } : {}),
    ...(values["keep-placeholders"] === true ? { keepPlaceholders: true } : {}),
  };
}

/** Reads the light curves of FILE with the column options; the readers' warnings go to stderr. */
export async function readInput(path: string, values: VerbArguments["values"], io: CliIo, quiet: boolean): Promise<LightCurve[]> {
  const set = await readLightCurves(resolve(io.cwd, path), lightCurveReadOptions(values));
  if (!quiet) for (const warning of set.warnings) io.stderr(`warning: ${warning}\n`);
  return set.lightCurves;
}

function optional<K extends string>(key: K, value: string | undefined): Partial<Record<K, string>> {
  return value === undefined ? {} : ({ [key]: value } as Record<K, string>);
}
