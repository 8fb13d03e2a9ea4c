import { mkdirSync, writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { openCatalogue } from "../../../batch/catalogue-input.js";
import { compiledCliPath } from "../../../batch/compiled-location.js";
import { slurmJobScript } from "../../../batch/slurm-job-script.js";
import { UsageError } from "../../../errors/usage-error.js";
import type { CliIo } from "../../cli-io.js";
import { integerOption, textOption, valueOptions, withParsedArguments } from "../../verb-arguments.js";
import { CATALOGUE_FIT_OPTIONS, catalogueFitChoice } from "./catalogue-fit-arguments.js";

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
  and the fitting and column options of "horologium batch" (see horologium batch --help)

Example:
  horologium batch plan demo --model drw --seed 7 --shards 2 \\
    --cpus-per-task 4 --time-limit 04:00:00 --out-dir demo-drw-shards
  sbatch demo-drw-shards/batch-job.sh
`;

const PLAN_OPTIONS = {
  ...CATALOGUE_FIT_OPTIONS,
  ...valueOptions("shards", "out-dir", "script", "format", "cpus-per-task", "partition", "time-limit", "mem", "account"),
  ...valueOptions("max-running", "job-name", "launcher"),
};

/** `horologium batch plan`: writes a Slurm job-array script that fits the catalogue in shards. */
export const plan = withParsedArguments(PLAN_OPTIONS, PLAN_HELP, async ({ values, positionals }, io: CliIo): Promise<number> => {
  if (positionals.length !== 1) throw new UsageError("give the catalogue: a folder of light curves or a table");
  const choice = catalogueFitChoice(values, io);
  const shards = integerOption(values, "shards", 1);
  if (shards === undefined) throw new UsageError("--shards is required (the number of array tasks)");
  const dirOption = textOption(values, "out-dir");
  if (dirOption === undefined) throw new UsageError("--out-dir is required (a folder for the shard tables and logs)");
  const dir = resolve(io.cwd, dirOption);
  if (/\s/.test(dir)) throw new UsageError(`--out-dir ${dir}: Slurm log paths cannot hold spaces; choose another folder`);
  const format = textOption(values, "format") ?? "csv";
  if (format !== "csv" && format !== "parquet") throw new UsageError(`--format must be csv or parquet, got "${format}"`);
  // Open the catalogue now, so that a wrong path fails here and not in every task.
  const catalogue = await openCatalogue(resolve(io.cwd, positionals[0]), choice.read);
  const launcherText = textOption(values, "launcher");
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
    jobName: textOption(values, "job-name") ?? "horologium-batch",
    cpusPerTask: integerOption(values, "cpus-per-task", 1) ?? 1,
    partition: textOption(values, "partition"),
    timeLimit: textOption(values, "time-limit"),
    memory: textOption(values, "mem"),
    account: textOption(values, "account"),
    maxRunning: integerOption(values, "max-running", 1),
  });
  mkdirSync(resolve(dir, "logs"), { recursive: true });
  const scriptPath = resolve(io.cwd, textOption(values, "script") ?? resolve(dir, "batch-job.sh"));
  writeFileSync(scriptPath, script, { mode: 0o755 });
  io.stdout(`wrote ${scriptPath}: a job array of ${shards} tasks; submit it with\n  sbatch ${scriptPath}\n`);
  return 0;
});

