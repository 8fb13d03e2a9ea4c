import { mkdirSync, writeFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { parseArgs, type ParseArgsConfig } from "node:util";
import { runBatch, type BatchSummary, type ResultsFormat } from "../../batch/batch-run.js";
import { openCatalogue, type CatalogueReadOptions } from "../../batch/catalogue-input.js";
import { compiledCliPath } from "../../batch/compiled-location.js";
import { mergeResults, type MergeReport } from "../../batch/merge-results.js";
import { progressDisplay } from "../../batch/progress-display.js";
import { formatShard, parseShard, shardFromEnvironment, WHOLE_CATALOGUE, type ShardSpec } from "../../batch/shard.js";
import { slurmJobScript } from "../../batch/slurm-job-script.js";
import { formatDuration, formatRate, throughput } from "../../batch/throughput.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";

const MODELS = ["drw", "oscillator", "quasi-periodic"] as const;

const RUN_HELP = `Usage: horologium batch INPUT --model MODEL --out RESULTS [options]
       horologium batch plan INPUT --model MODEL --shards N --out-dir DIR [options]
       horologium batch merge SHARD_TABLE... --out RESULTS [--catalogue INPUT]

Fits every object of a catalogue, on all cores, and writes one row per object: every parameter
summary of the fit (columns <parameter>.<statistic>, e.g. tau.median, tau.q2.5), the data size
(data.*), the diagnostics (diagnostics.*), the warnings (a JSON list), and the status: "ok", or
"failed" with the reason. A failing object never stops the run.

INPUT is a folder of light-curve files (one object per file; the id is the file name without
extension), or one table of many objects (CSV, TSV or Parquet, rows grouped by object) with --id-col
naming the object-id column.

Results are durable as they come: each row is appended to RESULTS.journal.jsonl and flushed to
disk before it counts. A run killed at any moment (even kill -9) is finished by running the same
command with --resume: finished objects are kept, nothing is written twice. CSV results grow row by
row; Parquet results are written at the end (both are replaced atomically, never half-written).

Options:
  --model drw|oscillator|quasi-periodic   the model to fit (required)
  --out FILE              results table, .csv or .parquet (required)
  --background drw        add a damped-random-walk background to the model
  --seed N                run seed (default 1); each object is fitted with its own seed, derived
                          from the run seed and its id, so results do not depend on order, shard
                          or number of workers (the seed column reproduces one object's fit with
                          horologium fit FILE --seed SEED)
  --id-col NAME           the object-id column, when INPUT is one table
  --time-col, --value-col, --error-col, --band-col NAME   choose columns (--error-col none: no errors)
  --band NAME             fit this band of multi-band light curves
  --workers N             worker threads (default: the CPUs available, or SLURM_CPUS_PER_TASK)
  --worker-memory MB      JavaScript heap limit of each worker (typed-array buffers are not
                          counted); an object whose fit needs more is recorded as failed
                          (default: Node's own limit, which also stops only that worker)
  --shard K/N             fit only shard K of N (K = 0..N-1), a deterministic share by object id;
                          default from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT when set
  --resume                continue an interrupted run (starts afresh if there is none)
  --overwrite             discard earlier results at --out and start again
  --sampler nuts|ensemble the posterior sampler (default ensemble, as measured in bench/samplers-compare.ts)
  --max-evaluations N     sampling budget per object, in log-likelihood evaluations (default 2e6);
                          a fit that runs out is reported with diagnostics.converged false
  --jitter                fit a white-noise jitter even where light curves have errors
  --timeout SECONDS       give up on an object after this long (recorded as failed)
  --fit-module FILE       fit with fitLightCurve(lightCurve, options) exported by this ES module
                          instead of Horologium's own (for custom models)
  --quiet                 no progress and no summary
  -h, --help              this help

Sub-verbs (each has --help):
  plan                    write a Slurm job-array script that fits the catalogue in N shards
  merge                   join shard tables; report failed, duplicated and missing objects

Example (an invented survey, 5000 quasar light curves, one CSV file each):
  horologium batch lanternfield/quasars --model drw --seed 7 --out quasars-drw.csv
  # interrupted? the same command with --resume finishes it
`;

const PLAN_HELP = `Usage: horologium batch plan INPUT --model MODEL --shards N --out-dir DIR [options]

Writes a bash script for sbatch that fits the catalogue as a Slurm job array of N tasks: task K runs
"horologium batch INPUT ... --shard K/N --resume" with as many workers as CPUs per task, and writes
DIR/shard-K.csv (or .parquet) and its log DIR/logs/shard-K.log. Every task resumes, so a task that is
requeued or resubmitted does not redo finished objects. When all tasks have ended, join the shards
with "horologium batch merge" (the script ends with the exact command).

Options:
  --shards N              number of array tasks (required)
  --out-dir DIR           folder for shard tables and logs, created if needed (required)
  --script FILE           where to write the script (default DIR/batch-job.sh)
  --format csv|parquet    shard table format (default csv)
  --cpus-per-task C       CPUs (and workers) per task (default 1)
  --partition NAME, --time-limit T, --mem M, --account NAME   passed to sbatch
  --max-running M         run at most M tasks at once
  --job-name NAME         (default horologium-batch)
  --launcher CMD          how compute nodes run Horologium (default: this node and this build,
                          by absolute paths; e.g. --launcher horologium when it is installed)
  and the fitting options of "horologium batch": --model, --background, --seed, --id-col,
  --time-col, --value-col, --error-col, --band-col, --band, --sampler, --max-evaluations, --jitter,
  --timeout, --fit-module

Example:
  horologium batch plan lanternfield/quasars --model drw --seed 7 --shards 40 \\
    --cpus-per-task 4 --time-limit 04:00:00 --out-dir /scratch/lanternfield-drw
  sbatch /scratch/lanternfield-drw/batch-job.sh
`;

const MERGE_HELP = `Usage: horologium batch merge SHARD_TABLE... --out RESULTS [--catalogue INPUT]

Joins the results tables of the shards of a run (CSV or Parquet) into one table (.csv or .parquet)
and reports: how many objects are ok and failed (listing the first failures with their reasons),
objects found in more than one shard (the first is kept), shards missing from the set (from the
journals beside the tables), and, with --catalogue, the objects of the catalogue that no shard
recorded. Refuses to join tables of different runs (another model, seed or input).
Exit status 0 when nothing is missing, 3 when shards or objects are missing.

Options:
  --out FILE              merged table, .csv or .parquet (required)
  --catalogue INPUT       the catalogue the shards were fitted from, to list missing objects
  --id-col NAME           its object-id column, when it is one table
  --missing-list FILE     write the ids of missing objects to FILE, one per line
  --quiet                 print nothing but problems
  -h, --help              this help

Example:
  horologium batch merge /scratch/lanternfield-drw/shard-*.csv --catalogue lanternfield/quasars \\
    --out lanternfield-drw.csv
`;

/** Options shared by the run and the plan: what to fit and how to read it. */
const FIT_OPTIONS = {
  model: { type: "string" },
  background: { type: "string" },
  seed: { type: "string" },
  "id-col": { type: "string" },
  "time-col": { type: "string" },
  "value-col": { type: "string" },
  "error-col": { type: "string" },
  "band-col": { type: "string" },
  band: { type: "string" },
  timeout: { type: "string" },
  "fit-module": { type: "string" },
  sampler: { type: "string" },
  "max-evaluations": { type: "string" },
  jitter: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const satisfies ParseArgsConfig["options"];

type Values = Record<string, string | boolean | string[] | undefined>;

function parse(args: string[], options: ParseArgsConfig["options"]): { values: Values; positionals: string[] } {
  try {
    const { values, positionals } = parseArgs({ args, options, allowPositionals: true, strict: true });
    return { values: values as Values, positionals };
  } catch (error) {
    throw new UsageError((error as Error).message.split("\n")[0]);
  }
}

function text(values: Values, name: string): string | undefined {
  const value = values[name];
  return typeof value === "string" ? value : undefined;
}

function positiveInteger(values: Values, name: string): number | undefined {
  const value = text(values, name);
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value) || Number(value) < 1) throw new UsageError(`--${name} must be a positive integer, got "${value}"`);
  return Number(value);
}

function positiveNumber(values: Values, name: string): number | undefined {
  const value = text(values, name);
  if (value === undefined) return undefined;
  const number = Number(value);
  if (!(number > 0) || !Number.isFinite(number)) throw new UsageError(`--${name} must be a positive number, got "${value}"`);
  return number;
}

function formatOf(path: string, option: string): ResultsFormat {
  if (/\.csv$/i.test(path)) return "csv";
  if (/\.parquet$/i.test(path)) return "parquet";
  throw new UsageError(`${option} ${path}: the results table must end in .csv or .parquet`);
}

/** What to fit, validated: shared by the run and the plan. */
interface FitChoice {
  readonly model: string;
  readonly background?: string;
  readonly seed: string;
  readonly read: CatalogueReadOptions;
  readonly timeoutSeconds?: number;
  readonly fitModule?: string;
  /** Options handed to the fit as they are: sampler, budget, jitter. */
  readonly fitOptions: Record<string, string | number | boolean>;
  /** The same choices as command-line arguments, for job scripts. */
  readonly arguments: string[];
}

function fitChoice(values: Values, io: CliIo): FitChoice {
  const model = text(values, "model");
  if (model === undefined) throw new UsageError(`--model is required (${MODELS.join(", ")})`);
  if (!(MODELS as readonly string[]).includes(model)) {
    throw new UsageError(`--model must be one of ${MODELS.join(", ")}, got "${model}"`);
  }
  const background = text(values, "background");
  if (background !== undefined && background !== "drw") throw new UsageError(`--background must be drw, got "${background}"`);
  const seed = text(values, "seed") ?? "1";
  if (!/^\d+$/.test(seed)) throw new UsageError(`--seed must be a non-negative integer, got "${seed}"`);
  const errorColumn = text(values, "error-col");
  const read: CatalogueReadOptions = {
    idColumn: text(values, "id-col"),
    timeColumn: text(values, "time-col"),
    valueColumn: text(values, "value-col"),
    errorColumn: errorColumn === "none" ? null : errorColumn,
    bandColumn: text(values, "band-col"),
    band: text(values, "band"),
  };
  const timeoutSeconds = positiveNumber(values, "timeout");
  const modulePath = text(values, "fit-module");
  const fitModule = modulePath === undefined ? undefined : pathToFileURL(resolve(io.cwd, modulePath)).href;
  const fitOptions: Record<string, string | number | boolean> = {};
  const sampler = text(values, "sampler");
  if (sampler !== undefined) {
    if (sampler !== "nuts" && sampler !== "ensemble") throw new UsageError(`--sampler must be nuts or ensemble, got "${sampler}"`);
    fitOptions.sampler = sampler;
  }
  const maxEvaluations = positiveInteger(values, "max-evaluations");
  if (maxEvaluations !== undefined) fitOptions.maxEvaluations = maxEvaluations;
  if (values.jitter === true) fitOptions.jitter = true;
  const argumentsList: string[] = ["--model", model, "--seed", seed];
  if (background) argumentsList.push("--background", background);
  for (const name of ["id-col", "time-col", "value-col", "error-col", "band-col", "band", "timeout", "sampler", "max-evaluations"]) {
    const value = text(values, name);
    if (value !== undefined) argumentsList.push(`--${name}`, value);
  }
  if (values.jitter === true) argumentsList.push("--jitter");
  if (modulePath !== undefined) argumentsList.push("--fit-module", resolve(io.cwd, modulePath));
  return { model, background, seed, read, timeoutSeconds, fitModule, fitOptions, arguments: argumentsList };
}

function defaultWorkers(io: CliIo): number {
  const slurm = Number(io.env.SLURM_CPUS_PER_TASK);
  const available = availableParallelism();
  return Number.isInteger(slurm) && slurm > 0 ? Math.min(slurm, available) : available;
}

async function fitCatalogue(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    ...FIT_OPTIONS,
    out: { type: "string" },
    workers: { type: "string" },
    "worker-memory": { type: "string" },
    shard: { type: "string" },
    resume: { type: "boolean" },
    overwrite: { type: "boolean" },
    quiet: { type: "boolean" },
  });
  if (values.help) {
    io.stdout(RUN_HELP);
    return 0;
  }
  if (positionals.length !== 1) {
    throw new UsageError(positionals.length === 0 ? "give the catalogue: a folder of light curves or a table" : `one INPUT expected, got ${positionals.length}`);
  }
  const choice = fitChoice(values, io);
  const outOption = text(values, "out");
  if (outOption === undefined) throw new UsageError("--out is required (a .csv or .parquet results table)");
  const out = resolve(io.cwd, outOption);
  const format = formatOf(outOption, "--out");
  if (values.resume && values.overwrite) throw new UsageError("--resume and --overwrite exclude each other");
  const quiet = values.quiet === true;

  let shard: ShardSpec = WHOLE_CATALOGUE;
  const shardText = text(values, "shard");
  if (shardText !== undefined) shard = parseShard(shardText);
  else {
    const fromSlurm = shardFromEnvironment(io.env);
    if (fromSlurm) {
      shard = fromSlurm;
      if (!quiet) io.stderr(`batch: shard ${formatShard(shard)} (from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT)\n`);
    }
  }
  const workers = positiveInteger(values, "workers") ?? defaultWorkers(io);

  const catalogue = await openCatalogue(resolve(io.cwd, positionals[0]), choice.read);
  const display = quiet
    ? undefined
    : progressDisplay({ write: io.stderr, isTerminal: io.stderrIsTty, now: io.now });
  let summary: BatchSummary;
  try {
    summary = await runBatch({
      objects: catalogue.objects(),
      listIds: () => catalogue.ids(),
      inputDescription: JSON.stringify({ path: catalogue.path, ...choice.read }),
      out,
      format,
      model: choice.model,
      background: choice.background,
      seed: choice.seed,
      fitOptions: choice.fitOptions,
      shard,
      workers,
      fitModule: choice.fitModule,
      timeoutSeconds: choice.timeoutSeconds,
      memoryLimitMb: positiveInteger(values, "worker-memory"),
      mode: values.resume ? "resume" : values.overwrite ? "overwrite" : "new",
      now: io.now,
      env: io.env,
      onProgress: display ? (progress) => display.update(progress) : undefined,
    });
  } finally {
    display?.stop();
  }
  if (!quiet) io.stderr(describeRun(summary, shard, outOption));
  return 0;
}

function describeRun(summary: BatchSummary, shard: ShardSpec, outOption: string): string {
  const { rate } = throughput(summary.recorded, summary.toDo, summary.elapsedMs);
  const lines: string[] = [];
  const scope = shard.count > 1 ? ` in shard ${formatShard(shard)}` : "";
  lines.push(
    `batch: ${summary.ok} fitted, ${summary.failed} failed${scope} in ${formatDuration(summary.elapsedMs / 1000)}` +
      ` (${formatRate(rate)})` +
      (summary.resumed > 0 ? `; ${summary.resumed} already done by the interrupted run` : ""),
  );
  if (summary.repairedBytes > 0) lines.push(`batch: removed a row cut short by the interruption (${summary.repairedBytes} bytes); it was fitted again`);
  for (const failure of summary.failureExamples) lines.push(`batch: failed ${failure.id}: ${failure.reason}`);
  if (summary.failed > summary.failureExamples.length) {
    lines.push(`batch: ... and ${summary.failed - summary.failureExamples.length} more failures (status column)`);
  }
  if (summary.duplicates > 0) {
    lines.push(
      `batch: ${summary.duplicates} duplicated object id(s) in the input, fitted once: ${summary.duplicateExamples.join(", ")}`,
    );
  }
  lines.push(`batch: ${summary.totalOk + summary.totalFailed} objects in ${outOption} (${summary.totalOk} ok, ${summary.totalFailed} failed)`);
  return lines.join("\n") + "\n";
}

async function plan(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    ...FIT_OPTIONS,
    shards: { type: "string" },
    "out-dir": { type: "string" },
    script: { type: "string" },
    format: { type: "string" },
    "cpus-per-task": { type: "string" },
    partition: { type: "string" },
    "time-limit": { type: "string" },
    mem: { type: "string" },
    account: { type: "string" },
    "max-running": { type: "string" },
    "job-name": { type: "string" },
    launcher: { type: "string" },
  });
  if (values.help) {
    io.stdout(PLAN_HELP);
    return 0;
  }
  if (positionals.length !== 1) throw new UsageError("give the catalogue: a folder of light curves or a table");
  const choice = fitChoice(values, io);
  const shards = positiveInteger(values, "shards");
  if (shards === undefined) throw new UsageError("--shards is required (the number of array tasks)");
  const dirOption = text(values, "out-dir");
  if (dirOption === undefined) throw new UsageError("--out-dir is required (a folder for the shard tables and logs)");
  const dir = resolve(io.cwd, dirOption);
  if (/\s/.test(dir)) throw new UsageError(`--out-dir ${dir}: Slurm log paths cannot hold spaces; choose another folder`);
  const format = text(values, "format") ?? "csv";
  if (format !== "csv" && format !== "parquet") throw new UsageError(`--format must be csv or parquet, got "${format}"`);
  // Open the catalogue now, so that a wrong path fails here and not in every task.
  const catalogue = await openCatalogue(resolve(io.cwd, positionals[0]), choice.read);
  const launcherText = text(values, "launcher");
  const launcher = launcherText === undefined ? [process.execPath, compiledCliPath()] : launcherText.split(/\s+/).filter(Boolean);
  const mergeArguments = ["--catalogue", catalogue.path];
  if (choice.read.idColumn !== undefined) mergeArguments.push("--id-col", choice.read.idColumn);
  const script = slurmJobScript({
    shards,
    launcher,
    batchArguments: [catalogue.path, ...choice.arguments],
    mergeArguments,
    outputDirectory: dir,
    format,
    jobName: text(values, "job-name") ?? "horologium-batch",
    cpusPerTask: positiveInteger(values, "cpus-per-task") ?? 1,
    partition: text(values, "partition"),
    timeLimit: text(values, "time-limit"),
    memory: text(values, "mem"),
    account: text(values, "account"),
    maxRunning: positiveInteger(values, "max-running"),
  });
  mkdirSync(resolve(dir, "logs"), { recursive: true });
  const scriptPath = resolve(io.cwd, text(values, "script") ?? resolve(dir, "batch-job.sh"));
  writeFileSync(scriptPath, script, { mode: 0o755 });
  io.stdout(`wrote ${scriptPath}: a job array of ${shards} tasks; submit it with\n  sbatch ${scriptPath}\n`);
  return 0;
}

async function merge(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    out: { type: "string" },
    catalogue: { type: "string" },
    "id-col": { type: "string" },
    "missing-list": { type: "string" },
    quiet: { type: "boolean" },
    help: { type: "boolean", short: "h" },
  });
  if (values.help) {
    io.stdout(MERGE_HELP);
    return 0;
  }
  if (positionals.length === 0) throw new UsageError("give the shard tables to merge");
  const outOption = text(values, "out");
  if (outOption === undefined) throw new UsageError("--out is required (a .csv or .parquet table)");
  const out = resolve(io.cwd, outOption);
  const inputs = positionals.map((input) => resolve(io.cwd, input));
  if (inputs.includes(out)) throw new UsageError(`--out ${outOption} is also one of the tables to merge`);
  const catalogueOption = text(values, "catalogue");
  const catalogue =
    catalogueOption === undefined
      ? undefined
      : await openCatalogue(resolve(io.cwd, catalogueOption), { idColumn: text(values, "id-col") });
  const missingList = text(values, "missing-list");
  if (missingList !== undefined && !catalogue) throw new UsageError("--missing-list needs --catalogue");
  const missingIds: string[] = [];
  const report = await mergeResults({
    inputs,
    out,
    format: formatOf(outOption, "--out"),
    catalogueIds: catalogue ? () => catalogue.ids() : undefined,
    onMissing: missingList !== undefined ? (id) => missingIds.push(id) : undefined,
  });
  if (missingList !== undefined) {
    writeFileSync(resolve(io.cwd, missingList), missingIds.map((id) => `${id}\n`).join(""));
  }
  const incomplete = report.missingShards.length > 0 || (report.missing ?? 0) > 0;
  if (!values.quiet || incomplete) io.stdout(describeMerge(report, outOption));
  return incomplete ? 3 : 0;
}

function describeMerge(report: MergeReport, outOption: string): string {
  const lines = [`merged ${report.inputs} table(s) into ${outOption}: ${report.rows} objects, ${report.ok} ok, ${report.failed} failed`];
  for (const failure of report.failureExamples) lines.push(`  failed ${failure.id}: ${failure.reason}`);
  if (report.failed > report.failureExamples.length) lines.push(`  ... and ${report.failed - report.failureExamples.length} more failed`);
  if (report.duplicates > 0) {
    lines.push(`${report.duplicates} object(s) in more than one table, first kept: ${report.duplicateExamples.join(", ")}`);
  }
  if (report.missingShards.length > 0) {
    lines.push(`missing shard(s) of ${report.shardCount}: ${report.missingShards.join(", ")}`);
  }
  if (report.missing !== undefined) {
    lines.push(
      report.missing === 0
        ? "every object of the catalogue is in the table"
        : `${report.missing} object(s) of the catalogue are in no table: ${report.missingExamples.join(", ")}${
            report.missing > report.missingExamples.length ? ", ..." : ""
          }`,
    );
  }
  return lines.join("\n") + "\n";
}

/** `horologium batch`: fit a catalogue on all cores; `plan` a Slurm job array; `merge` its shards. */
export const verb: CliVerb = {
  summary: "fit a whole catalogue on all cores, or as a Slurm job array (plan, merge)",
  async run(args: string[], io: CliIo): Promise<number> {
    if (args[0] === "plan") return plan(args.slice(1), io);
    if (args[0] === "merge") return merge(args.slice(1), io);
    return fitCatalogue(args, io);
  },
};
