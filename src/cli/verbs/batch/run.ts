import { availableParallelism } from "node:os";
import { resolve } from "node:path";
import { runBatch, type BatchSummary } from "../../../batch/batch-run.js";
import { openCatalogue } from "../../../batch/catalogue-input.js";
import { progressDisplay } from "../../../batch/progress-display.js";
import { formatShard, parseShard, shardFromEnvironment, WHOLE_CATALOGUE, type ShardSpec } from "../../../batch/shard.js";
import { formatDuration, formatRate, throughput } from "../../../batch/throughput.js";
import { UsageError } from "../../../errors/usage-error.js";
import type { CliIo } from "../../cli-io.js";
import { FIT_HELP } from "../../fit-arguments.js";
import { COLUMN_HELP, integerOption, textOption, withParsedArguments } from "../../verb-arguments.js";
import { CATALOGUE_FIT_OPTIONS, CATALOGUE_HELP, catalogueFitChoice, perObjectFitOptions, resultsFormatOf } from "./catalogue-fit-arguments.js";

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

Each object is fitted with its own seed, derived from the run seed (--seed) and its id, so results
do not depend on order, shard or number of workers; the seed column reproduces one object's fit
with horologium fit FILE --seed SEED.

Options:
  --out FILE              results table, .csv or .parquet (required)
${FIT_HELP}
${CATALOGUE_HELP}
${COLUMN_HELP}
  --workers N             worker threads (default: the CPUs available, or SLURM_CPUS_PER_TASK)
  --worker-memory MB      JavaScript heap limit of each worker (typed-array buffers are not
                          counted); an object whose fit needs more is recorded as failed
                          (default: Node's own limit, which also stops only that worker)
  --shard K/N             fit only shard K of N (K = 0..N-1), a deterministic share by object id;
                          default from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT when set
  --resume                continue an interrupted run (starts afresh if there is none)
  --overwrite             discard earlier results at --out and start again
  --quiet                 no progress and no summary
  -h, --help              this help

Sub-verbs (each has --help):
  plan                    write a Slurm job-array script that fits the catalogue in N shards
  merge                   join shard tables; report failed, duplicated and missing objects

Example (every light curve in demo/; a survey folder of 5000 files works the same way):
  horologium batch demo --model drw --seed 7 --out demo-drw.csv
  # interrupted? the same command with --resume finishes it
`;

const RUN_OPTIONS = {
  ...CATALOGUE_FIT_OPTIONS,
  out: { type: "string" },
  workers: { type: "string" },
  "worker-memory": { type: "string" },
  shard: { type: "string" },
  resume: { type: "boolean" },
  overwrite: { type: "boolean" },
  quiet: { type: "boolean" },
} as const;

function defaultWorkers(io: CliIo): number {
  const slurm = Number(io.env.SLURM_CPUS_PER_TASK);
  const available = availableParallelism();
  return Number.isInteger(slurm) && slurm > 0 ? Math.min(slurm, available) : available;
}

/** `horologium batch INPUT ...`: fits every object of a catalogue on worker threads. */
export const fitCatalogue = withParsedArguments(RUN_OPTIONS, RUN_HELP, async ({ values, positionals }, io: CliIo): Promise<number> => {
  if (positionals.length !== 1) {
    throw new UsageError(positionals.length === 0 ? "give the catalogue: a folder of light curves or a table" : `one INPUT expected, got ${positionals.length}`);
  }
  const choice = catalogueFitChoice(values, io);
  const outOption = textOption(values, "out");
  if (outOption === undefined) throw new UsageError("--out is required (a .csv or .parquet results table)");
  const out = resolve(io.cwd, outOption);
  const format = resultsFormatOf(outOption, "--out");
  if (values.resume && values.overwrite) throw new UsageError("--resume and --overwrite exclude each other");
  const quiet = values.quiet === true;

  let shard: ShardSpec = WHOLE_CATALOGUE;
  const shardText = textOption(values, "shard");
  if (shardText !== undefined) shard = parseShard(shardText);
  else {
    const fromSlurm = shardFromEnvironment(io.env);
    if (fromSlurm) {
      shard = fromSlurm;
      if (!quiet) io.stderr(`batch: shard ${formatShard(shard)} (from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT)\n`);
    }
  }
  const workers = integerOption(values, "workers", 1) ?? defaultWorkers(io);

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
      model: choice.fit.model,
      ...(choice.fit.background !== undefined ? { background: choice.fit.background } : {}),
      seed: choice.fit.seed,
      fitOptions: perObjectFitOptions(choice.fit, choice.bandRule),
      shard,
      workers,
      ...(choice.fitModule !== undefined ? { fitModule: choice.fitModule } : {}),
      ...(choice.timeoutSeconds !== undefined ? { timeoutSeconds: choice.timeoutSeconds } : {}),
      memoryLimitMb: integerOption(values, "worker-memory", 1),
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
});

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

