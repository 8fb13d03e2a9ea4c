import { parseArgs, type ParseArgsConfig } from "node:util";
import { UsageError } from "../errors/usage-error.js";
import { nearestOption } from "./nearest-option.js";

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
    const message = (error as Error).message.split("\n")[0] ?? "";
    const unknown = /^Unknown option '--?([^']+)'/.exec(message)?.[1];
    const nearest = unknown === undefined ? undefined : nearestOption(unknown, [...Object.keys(options), "help"]);
    if (nearest !== undefined) throw new UsageError(`unknown option --${unknown}: did you mean --${nearest}? (see --help)`);
    if (unknown !== undefined) throw new UsageError(`unknown option --${unknown} (see --help for the options)`);
    throw new UsageError(`${message} (see --help)`);
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

/**
 * An integer option of at least `minimum` (0: non-negative, 1: positive) and at most 2^53 - 1, or undefined
 * when absent; exponent notation (2e6) is allowed. A UsageError names the option otherwise.
 */
export function integerOption(values: VerbArguments["values"], name: string, minimum: 0 | 1): number | undefined {
  const text = textOption(values, name);
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === "" || !Number.isSafeInteger(value) || value < minimum)
    throw new UsageError(`--${name} must be a ${minimum === 0 ? "non-negative" : "positive"} integer, got "${text}"`);
  return value;
}

/**
 * The seed option of every verb: a non-negative integer (default 1). The per-object seeds of a batch are
 * 48-bit integers, so `horologium fit --seed` reproduces one object's fit.
 */
export function seedOption(values: VerbArguments["values"]): number {
  return integerOption(values, "seed", 0) ?? 1;
}
