import type { ResultsFormat } from "./batch-run.js";

/** What a Slurm job-array script for a catalogue needs. */
export interface SlurmJobScriptOptions {
  /** Number of shards, one array task each (tasks 0 to N-1). */
  readonly shards: number;
  /** The command that runs Horologium on the compute nodes, for example [node, /abs/dist/src/cli/bin.js]. */
  readonly launcher: readonly string[];
  /** Arguments of `horologium batch` other than --out, --shard and --workers: the input and fit options. */
  readonly batchArguments: readonly string[];
  /** Further arguments of the suggested `horologium batch merge` (for example the catalogue, to list missing objects). */
  readonly mergeArguments?: readonly string[];
  /** Absolute folder for the shard tables and, in `logs/`, the task logs. */
  readonly outputDirectory: string;
  readonly format: ResultsFormat;
  readonly jobName: string;
  /** CPUs per task; each task runs that many workers. */
  readonly cpusPerTask: number;
  readonly partition?: string;
  /** Wall-clock limit per task, in a form sbatch accepts (for example 04:00:00). */
  readonly timeLimit?: string;
  /** Memory per task, in a form sbatch accepts (for example 4G). */
  readonly memory?: string;
  readonly account?: string;
  /** At most this many tasks at once (the `%` throttle of --array). */
  readonly maxRunning?: number;
}

/** Quotes a word for bash when it needs it: `'...'`, with embedded single quotes as `'\''`. */
export function shellQuote(word: string): string {
  return /^[A-Za-z0-9_\/.:=,+@%^-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

/**
 * Lays a command out one option per line for reading: the program words up to the first option on the
 * first line, then each option with its value.
 */
function optionLines(words: readonly string[]): string[] {
  const firstOption = words.findIndex((word) => word.startsWith("--"));
  const head = firstOption < 0 ? words.length : firstOption;
  const lines: string[] = [words.slice(0, head).join(" ")];
  for (const word of words.slice(head)) {
    const previous = lines[lines.length - 1];
    if (previous.startsWith("--") && !previous.includes(" ") && !word.startsWith("--")) lines[lines.length - 1] = `${previous} ${word}`;
    else lines.push(word);
  }
  return lines;
}

/** The path of shard K's table in the output folder: `shard-K.csv` (or `.parquet`). */
export function shardTableName(index: number | string, format: ResultsFormat): string {
  return `shard-${index}.${format}`;
}

/**
 * Writes the text of a bash script for `sbatch` that fits a catalogue as a job array: task K runs
 * `horologium batch ... --shard K/N --resume`, with as many workers as CPUs it was given, writing
 * `shard-K.csv` in the output folder and its log in `logs/`. Because every task resumes, a task that
 * was preempted, requeued or resubmitted finishes its shard without redoing finished objects. The
 * script ends with the merge command as a comment.
 */
export function slurmJobScript(options: SlurmJobScriptOptions): string {
  const { shards, outputDirectory: dir } = options;
  if (!Number.isInteger(shards) || shards < 1) throw new RangeError(`shards must be a positive integer, got ${shards}`);
  const throttle = options.maxRunning ? `%${options.maxRunning}` : "";
  const directives = [
    `--job-name=${options.jobName}`,
    `--array=0-${shards - 1}${throttle}`,
    `--cpus-per-task=${options.cpusPerTask}`,
    "--ntasks=1",
    `--output=${dir}/logs/shard-%a.log`,
    ...(options.partition ? [`--partition=${options.partition}`] : []),
    ...(options.timeLimit ? [`--time=${options.timeLimit}`] : []),
    ...(options.memory ? [`--mem=${options.memory}`] : []),
    ...(options.account ? [`--account=${options.account}`] : []),
  ];
  const out = `${shellQuote(dir)}/${shardTableName('"${SLURM_ARRAY_TASK_ID}"', options.format)}`;
  const command = [
    ...options.launcher.map(shellQuote),
    "batch",
    ...options.batchArguments.map(shellQuote),
    "--shard",
    `"\${SLURM_ARRAY_TASK_ID}/${shards}"`,
    "--workers",
    '"${SLURM_CPUS_PER_TASK:-1}"',
    "--out",
    out,
    "--resume",
  ];
  const merge = [
    ...options.launcher.map(shellQuote),
    "batch",
    "merge",
    `${shellQuote(dir)}/shard-*.${options.format}`,
    ...(options.mergeArguments ?? []).map(shellQuote),
    "--out",
    `${shellQuote(dir)}/merged.${options.format}`,
  ];
  return [
    "#!/bin/bash",
    "# Fits one shard of a catalogue per array task; written by `horologium batch plan`.",
    ...directives.map((directive) => `#SBATCH ${directive}`),
    "",
    "set -euo pipefail",
    `echo "shard \${SLURM_ARRAY_TASK_ID}/${shards} on $(hostname) with \${SLURM_CPUS_PER_TASK:-1} CPUs"`,
    optionLines(command).join(" \\\n  "),
    "",
    "# When every task has ended, join the shards and list what is missing or failed:",
    `#   ${merge.join(" ")}`,
    "",
  ].join("\n");
}
