import { parseArgs, type ParseArgsConfig } from "node:util";
import { UsageError } from "../errors/usage-error.js";
import type { CliIo } from "./cli-io.js";
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

/**
 * Options that take a value, one per name (`--name VALUE`, read as text: the verb reads and checks each
 * with {@link textOption}, {@link numberOption} or {@link integerOption}).
 */
export function valueOptions<Name extends string>(...names: Name[]): Record<Name, { readonly type: "string" }> {
  return Object.fromEntries(names.map((name) => [name, { type: "string" }])) as Record<Name, { readonly type: "string" }>;
}

/** The output options of a verb that writes one file and may say nothing: `--out FILE` and `--quiet`. */
export const OUTPUT_OPTIONS = {
  out: { type: "string" },
  quiet: { type: "boolean" },
} as const;

/** The body of a verb: its parsed arguments and the outside world in, the exit status out. */
export type VerbBody<Parsed> = (parsed: Parsed, io: CliIo) => Promise<number>;

/**
 * The opening every verb shares, as a verb's `run`: the arguments parsed strictly against `options`
 * ({@link parseVerbArguments}); `--help` prints `help` and exits 0, anything else goes to `body`.
 */
export function withParsedArguments(options: Options, help: string, body: VerbBody<VerbArguments>): (args: string[], io: CliIo) => Promise<number> {
  return async (args, io) => {
    const parsed = parseVerbArguments(args, options, help, io.stdout);
    return parsed === undefined ? 0 : body(parsed, io);
  };
}

/** The parsed arguments of a verb that reads one input: the options, the one FILE argument and `--quiet`. */
export interface SingleInputArguments extends VerbArguments {
  readonly file: string;
  readonly quiet: boolean;
}

/**
 * The opening of a verb that reads one input (`horologium <verb> FILE [options]`): as
 * {@link withParsedArguments}, then exactly one positional argument (a usage error naming `what`
 * otherwise) and `--quiet`, handed to `body`.
 */
export function withSingleInput(
  options: Options,
  help: string,
  body: VerbBody<SingleInputArguments>,
  what = "FILE",
): (args: string[], io: CliIo) => Promise<number> {
  return withParsedArguments(options, help, (parsed, io) =>
    body({ ...parsed, file: singleInput(parsed.positionals, what), quiet: parsed.values.quiet === true }, io),
  );
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
