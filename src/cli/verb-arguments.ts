import { parseArgs, type ParseArgsConfig } from "node:util";
import { UsageError } from "../errors/usage-error.js";

type Options = NonNullable<ParseArgsConfig["options"]>;

/** Options every verb that reads a light curve accepts. */
export const COLUMN_OPTIONS: Options = {
  "time-col": { type: "string" },
  "value-col": { type: "string" },
  "error-col": { type: "string" },
  "band-col": { type: "string" },
  band: { type: "string" },
  unit: { type: "string" },
  "keep-placeholders": { type: "boolean" },
};

/** The help lines of the column options. */
export const COLUMN_HELP = `Column options (without them common names are recognised:
  time/mjd/jd/bjd/t; mag/flux/value/y; err/mag_err/magerr/flux_err/sigma/error):
  --time-col NAME, --value-col NAME, --error-col NAME (or "none"), --band-col NAME
  --band NAME             use only this band of a multi-band file
  --unit mag|flux         the value column's unit (default: from its name)
  --keep-placeholders     keep rows whose magnitude or error is a "no measurement" code
                          (99, 99.99, -99, -999); by default they are dropped and counted`;

/** Parsed arguments of a verb. */
export interface VerbArguments {
  readonly values: Record<string, string | boolean | undefined>;
  readonly positionals: string[];
}

/**
 * Parses a verb's arguments strictly (unknown options are usage errors). Returns undefined after printing
 * the help when --help is given.
 */
export function parseVerbArguments(args: string[], options: Options, help: string, print: (text: string) => void): VerbArguments | undefined {
  let parsed;
  try {
    parsed = parseArgs({ args, options: { ...options, help: { type: "boolean", short: "h" } }, allowPositionals: true, strict: true });
  } catch (error) {
    throw new UsageError(`${(error as Error).message.split("\n")[0]} (see --help)`);
  }
  if (parsed.values.help) {
    print(help);
    return undefined;
  }
  return { values: parsed.values as Record<string, string | boolean | undefined>, positionals: parsed.positionals };
}

/** A string option, or undefined. */
export function textOption(values: VerbArguments["values"], name: string): string | undefined {
  const value = values[name];
  return typeof value === "string" ? value : undefined;
}

/** A finite number option (or the fallback), with a usage error naming the option otherwise. */
export function numberOption(values: VerbArguments["values"], name: string, fallback?: number): number | undefined {
  const text = textOption(values, name);
  if (text === undefined) return fallback;
  const value = Number(text);
  if (text.trim() === "" || !Number.isFinite(value)) throw new UsageError(`--${name} must be a number, got "${text}"`);
  return value;
}

/** Exactly one positional argument (the input file), with a usage error otherwise. */
export function singleInput(positionals: string[], what = "FILE"): string {
  if (positionals.length !== 1) throw new UsageError(`expected one ${what} argument, got ${positionals.length} (see --help)`);
  return positionals[0];
}

/** The seed option: an integer (default 1). */
export function seedOption(values: VerbArguments["values"]): number {
  const seed = numberOption(values, "seed", 1)!;
  if (!Number.isInteger(seed)) throw new UsageError(`--seed must be an integer, got ${seed}`);
  return seed;
}

/** The period-range options of the verbs that search for a period (fit, predict, compare). */
export const PERIOD_OPTIONS: Options = {
  "min-period": { type: "string" },
  "max-period": { type: "string" },
};

/** The help lines of {@link PERIOD_OPTIONS}. */
export const PERIOD_HELP = `  --min-period P          shortest period searched and allowed (periodic models; default twice the
                          typical spacing of visits on different nights)
  --max-period P          longest period searched and allowed (default the baseline, or half of it
                          for quasi-periodic rotation, which needs two cycles)`;

/** `--min-period` and `--max-period` as positive numbers (either may be absent). */
export function periodLimitsFrom(values: VerbArguments["values"]): { minimumPeriod?: number; maximumPeriod?: number } {
  const minimumPeriod = numberOption(values, "min-period");
  const maximumPeriod = numberOption(values, "max-period");
  for (const [name, value] of [["min-period", minimumPeriod], ["max-period", maximumPeriod]] as const)
    if (value !== undefined && !(value > 0)) throw new UsageError(`--${name} must be > 0, got ${value}`);
  if (minimumPeriod !== undefined && maximumPeriod !== undefined && !(maximumPeriod > minimumPeriod))
    throw new UsageError(`--min-period (${minimumPeriod}) must be below --max-period (${maximumPeriod})`);
  return { ...(minimumPeriod !== undefined ? { minimumPeriod } : {}), ...(maximumPeriod !== undefined ? { maximumPeriod } : {}) };
}
