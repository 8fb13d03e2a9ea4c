import { InputError } from "../errors/input-error.js";
import { HOROLOGIUM_VERSION } from "../version.js";
import type { CliIo, CliVerb } from "./cli-io.js";
import { UsageError } from "../errors/usage-error.js";

/**
 * The verbs of the `horologium` command; each lives in `verbs/<name>.ts` and exports `verb: CliVerb`.
 * Loaded on demand, so that `horologium fit` does not load the batch machinery.
 */
const VERB_LOADERS: Readonly<Record<string, () => Promise<{ verb: CliVerb }>>> = {
  fit: () => import("./verbs/fit.js"),
  predict: () => import("./verbs/predict.js"),
  simulate: () => import("./verbs/simulate.js"),
  periodogram: () => import("./verbs/periodogram.js"),
  compare: () => import("./verbs/compare.js"),
  report: () => import("./verbs/report.js"),
  batch: () => import("./verbs/batch/batch.js"),
  demo: () => import("./verbs/demo.js"),
};

/** The verb names, in the order of the help. */
export const VERB_NAMES = Object.keys(VERB_LOADERS);

async function loadVerb(name: string): Promise<CliVerb | undefined> {
  const loader = Object.hasOwn(VERB_LOADERS, name) ? VERB_LOADERS[name] : undefined;
  return loader ? (await loader()).verb : undefined;
}

async function topLevelHelp(): Promise<string> {
  const lines = ["Usage: horologium <verb> [options]   (horologium <verb> --help for details)", "", "Verbs:"];
  for (const name of VERB_NAMES) {
    const verb = await loadVerb(name);
    if (verb) lines.push(`  ${name.padEnd(12)} ${verb.summary}`);
  }
  return lines.join("\n") + "\n";
}

/**
 * Runs the command line with explicit arguments and I/O; returns the exit code. Input and usage problems
 * become one line on stderr (exit 2); anything else is an internal error (exit 1), still without a stack
 * trace unless HOROLOGIUM_DEBUG is set.
 */
export async function runCli(argv: string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    io.stdout(await topLevelHelp());
    return name === undefined ? 2 : 0;
  }
  if (name === "--version") {
    io.stdout(`${HOROLOGIUM_VERSION}\n`);
    return 0;
  }
  try {
    const verb = await loadVerb(name);
    if (!verb) throw new UsageError(`unknown verb "${name}" (try horologium --help)`);
    return await verb.run(rest, io);
  } catch (error) {
    if (error instanceof InputError || error instanceof UsageError) {
      io.stderr(`horologium ${name}: ${error.message}\n`);
      return 2;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.stderr(`horologium ${name}: internal error: ${message}\n`);
    if (io.env.HOROLOGIUM_DEBUG && error instanceof Error) io.stderr(`${error.stack}\n`);
    return 1;
  }
}
