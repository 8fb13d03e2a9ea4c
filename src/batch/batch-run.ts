import { existsSync } from "node:fs";
import { UsageError } from "../errors/usage-error.js";
import type { CatalogueObject } from "./catalogue-object.js";
import { CsvResultsAppender, writeCsvTable } from "./csv-results-file.js";
import { FitPool, type FitOutcome } from "./fit-pool.js";
import { objectSeed } from "./object-seed.js";
import { ColumnTypeTracker, writeParquetTable } from "./parquet-results-file.js";
import { expectedColumns, orderColumns, unionColumns } from "./result-columns.js";
import { failedRow, withWarnings, type ResultRow } from "./result-row.js";
import { journalPathFor, journalRows, ResultsJournal, type JournalOpenMode, type RunIdentity } from "./results-journal.js";
import { acquireRunLock } from "./run-lock.js";
import { formatShard, isInShard, type ShardSpec } from "./shard.js";

/** The format of the results table, from the extension of `--out`. */
export type ResultsFormat = "csv" | "parquet";

/** Everything a batch run needs; the command line builds this from its options. */
export interface BatchRunOptions {
  /** The catalogue, in input order; the runner keeps the objects of its shard. */
  readonly objects: AsyncIterable<CatalogueObject>;
  /** Optionally, the catalogue's ids alone (cheap to list), to count the work up front for progress. */
  readonly listIds?: () => AsyncIterable<string>;
  /** Describes the input (its absolute path and the column options), for the run identity. */
  readonly inputDescription: string;
  readonly out: string;
  readonly format: ResultsFormat;
  readonly model: string;
  readonly background?: string;
  readonly seed: number | string;
  /** Further options handed to the fit unchanged (sampler budget and the like). */
  readonly fitOptions?: Readonly<Record<string, string | number | boolean>>;
  readonly shard: ShardSpec;
  readonly workers: number;
  /** URL of a module exporting `fitLightCurve`; undefined for the project's own fit. */
  readonly fitModule?: string;
  readonly timeoutSeconds?: number;
  readonly memoryLimitMb?: number;
  /** "new" refuses to touch earlier results, "resume" continues them, "overwrite" discards them. */
  readonly mode: JournalOpenMode;
  /** Wall-clock milliseconds (passed in, like every clock in Horologium). */
  readonly now: () => number;
  /** The environment, for the Slurm job that may hold the results' lock (see run-lock.ts). */
  readonly env?: Readonly<Record<string, string | undefined>>;
  /** Called once the work is counted and after every object recorded. */
  readonly onProgress?: (progress: BatchProgress) => void;
}

/** Where a run stands. */
export interface BatchProgress {
  /** Objects recorded by this invocation (fitted or failed). */
  readonly recorded: number;
  readonly ok: number;
  readonly failed: number;
  /** Objects of the shard found already recorded by an earlier, interrupted invocation. */
  readonly resumed: number;
  /** Objects this invocation has to record, when the ids could be listed up front. */
  readonly toDo?: number;
  /** Milliseconds since fitting started. */
  readonly elapsedMs: number;
}

/** What a finished run did. */
export interface BatchSummary extends BatchProgress {
  /** Objects in the results, this invocation's and earlier ones', ok and failed. */
  readonly totalOk: number;
  readonly totalFailed: number;
  /** Objects of the catalogue that belong to other shards. */
  readonly otherShards: number;
  /** Ids met a second time in the input; only the first occurrence is fitted. */
  readonly duplicates: number;
  readonly duplicateExamples: readonly string[];
  /** The first failures of this invocation (all of them are in the results table). */
  readonly failureExamples: readonly { readonly id: string; readonly reason: string }[];
  /** Bytes of a torn journal line removed on resuming. */
  readonly repairedBytes: number;
  readonly out: string;
  readonly journal: string;
}

const EXAMPLES = 10;

/**
 * Objects read ahead per worker, waiting for a free worker: with none, each worker idled while the
 * next light curve was read and parsed (about a millisecond per object with the tests' stand-in fit,
 * bench/README.md "Batch throughput"); memory holds this many more light curves per worker.
 */
const QUEUED_PER_WORKER = 1;

/** The identity recorded in the journal: a run resumes only with the same values. */
export function runIdentity(options: BatchRunOptions): RunIdentity {
  return {
    input: options.inputDescription,
    model: options.model,
    background: options.background ?? null,
    seed: String(options.seed),
    shard: formatShard(options.shard),
    fitModule: options.fitModule ?? null,
    fitOptions: JSON.stringify(
      Object.fromEntries(Object.entries(options.fitOptions ?? {}).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))),
    ),
  };
}

/**
 * Fits every object of a shard of a catalogue on a pool of worker threads and writes the results table.
 *
 * Objects are read one at a time, and the next is read only when a worker is free or about to be
 * (one object per worker waits in the queue), so memory holds a few light curves whatever the size of the catalogue (plus the set of ids, for resuming and for
 * duplicate checks). Each result row is appended to the journal as soon as it arrives (and flushed to
 * storage in the background); a CSV table is appended to alongside, a Parquet table is written from
 * the journal at the end (both atomically rebuilt from the journal whenever needed). With mode
 * "resume" the objects already recorded are skipped, so a run killed at any moment is finished by
 * running it again with `--resume`.
 * Each object is fitted with its own seed, {@link objectSeed}, so results do not depend on order,
 * shard or worker count. An object that cannot be read or fitted is recorded as "failed" with the
 * reason, and the run goes on.
 */
export async function runBatch(options: BatchRunOptions): Promise<BatchSummary> {
  if (options.mode === "new" && existsSync(options.out)) {
    throw new UsageError(`${options.out} exists: pass --resume to continue its run, or --overwrite to replace it`);
  }
  // Count the work first: a catalogue that cannot be read then fails before any file is written.
  let inShard: number | undefined;
  if (options.listIds) {
    inShard = 0;
    for await (const id of options.listIds()) if (isInShard(id, options.shard)) inShard += 1;
  }
  // Load the fit module in every worker before touching the results, so that a fit module that
  // cannot be used leaves nothing behind either.
  const pool = await FitPool.start({
    workers: options.workers,
    fitModule: options.fitModule,
    timeoutSeconds: options.timeoutSeconds,
    memoryLimitMb: options.memoryLimitMb,
  });
  try {
    return await fitWithPool(options, pool, inShard);
  } finally {
    await pool.close();
  }
}

/** The counts of one invocation so far, with the first few failures and duplicated ids as examples. */
interface RunTally {
  recorded: number;
  ok: number;
  failed: number;
  resumed: number;
  otherShards: number;
  duplicates: number;
  readonly failureExamples: { id: string; reason: string }[];
  readonly duplicateExamples: string[];
}

/** Where the rows of a run go: the journal, and the CSV table as it grows (flagged for a rebuild when a row brings new columns). */
interface RowSinks {
  readonly journal: ResultsJournal;
  csv: CsvResultsAppender | undefined;
  csvNeedsRebuild: boolean;
}

/** Stage 1: the columns of the table, the expected ones and those of the rows already recorded; a CSV table started with the rows so far. */
async function openRowSinks(options: BatchRunOptions, journal: ResultsJournal, journalPath: string, recordedColumns: readonly string[]) {
  let columns = expectedColumns(options.model, options.background) as readonly string[];
  for (const column of recordedColumns) columns = unionColumns(columns, { [column]: null });
  columns = orderColumns(columns);
  const sinks: RowSinks = { journal, csv: undefined, csvNeedsRebuild: false };
  if (options.format === "csv") {
    await writeCsvTable(options.out, columns, journalRows(journalPath));
    sinks.csv = new CsvResultsAppender(options.out, columns);
  }
  return { columns, sinks };
}

/** Appends one row to the journal and the CSV table and counts it. */
function recordRow(sinks: RowSinks, tally: RunTally, row: ResultRow): void {
  sinks.journal.append(row);
  if (sinks.csv) {
    if (unionColumns(sinks.csv.columns, row) !== sinks.csv.columns) sinks.csvNeedsRebuild = true;
    sinks.csv.append(row);
  }
  tally.recorded += 1;
  if (row.status === "ok") tally.ok += 1;
  else {
    tally.failed += 1;
    if (tally.failureExamples.length < EXAMPLES) tally.failureExamples.push({ id: String(row.object_id), reason: String(row.reason) });
  }
}

/**
 * Stage 2: every object of the catalogue in this shard, not seen before in the catalogue and not already
 * in the journal, fitted on the pool and recorded as it ends; objects without a light curve are
 * recorded as failed. Besides the fit running on each worker, one more object per worker is read and
 * waiting in the pool's queue ({@link QUEUED_PER_WORKER}), so a worker that finishes starts its next fit at once
 * instead of waiting for the catalogue to be read. Rethrows the first error of the pool itself.
 */
async function fitEveryObject(options: BatchRunOptions, pool: FitPool, done: Set<string>, tally: RunTally, record: (row: ResultRow) => void): Promise<void> {
  const seen = new Set<string>();
  const inFlight = new Set<Promise<void>>();
  let fatal: Error | undefined;
  for await (const object of options.objects) {
    if (fatal) break;
    const id = object.id;
    if (!isInShard(id, options.shard)) {
      tally.otherShards += 1;
      continue;
    }
    if (seen.has(id)) {
      tally.duplicates += 1;
      if (tally.duplicateExamples.length < EXAMPLES) tally.duplicateExamples.push(id);
      continue;
    }
    seen.add(id);
    if (done.delete(id)) {
      tally.resumed += 1;
      continue;
    }
    const seed = objectSeed(options.seed, id);
    const lightCurves = object.bands ?? (object.lightCurve ? [object.lightCurve] : []);
    if (lightCurves.length === 0) {
      record(failedRow(id, seed, options.model, object.problem ?? "no light curve"));
      continue;
    }
    const fitOptions = { ...options.fitOptions, model: options.model, background: options.background, seed };
    const task: Promise<void> = pool
      .fit(id, lightCurves, fitOptions)
      .then((outcome: FitOutcome) =>
        record(outcome.kind === "ok" ? withWarnings(outcome.row, object.warnings) : failedRow(id, seed, options.model, outcome.reason)),
      )
      .catch((error: Error) => {
        fatal ??= error;
      })
      .finally(() => inFlight.delete(task));
    inFlight.add(task);
    if (inFlight.size >= (1 + QUEUED_PER_WORKER) * pool.size) await Promise.race(inFlight);
  }
  await Promise.all(inFlight);
  if (fatal) throw fatal;
}

/** Stage 3: the final table from the journal: Parquet always written at the end, CSV rewritten only when rows brought new columns. */
async function writeFinalTable(options: BatchRunOptions, journalPath: string, columnsSoFar: readonly string[], csvNeedsRebuild: boolean): Promise<void> {
  let columns = columnsSoFar;
  if (options.format === "parquet") {
    const types = new ColumnTypeTracker();
    for await (const row of journalRows(journalPath)) {
      columns = unionColumns(columns, row);
      types.observe(row);
    }
    await writeParquetTable(options.out, orderColumns(columns), types, journalRows(journalPath), {
      "horologium.batch.run": JSON.stringify(runIdentity(options)),
    });
  } else if (csvNeedsRebuild) {
    for await (const row of journalRows(journalPath)) columns = unionColumns(columns, row);
    await writeCsvTable(options.out, orderColumns(columns), journalRows(journalPath));
  }
}

/** The run on a started pool, under the run lock: open the journal and table, fit every object, write the final table, summarise. */
async function fitWithPool(options: BatchRunOptions, pool: FitPool, inShard: number | undefined): Promise<BatchSummary> {
  const journalPath = journalPathFor(options.out);
  const lock = acquireRunLock(options.out, options.env);
  try {
    const { journal, contents } = await ResultsJournal.open(journalPath, runIdentity(options), options.mode);
    let sinks: RowSinks | undefined;
    try {
      const opened = await openRowSinks(options, journal, journalPath, contents.columns);
      sinks = opened.sinks;
      const rowSinks = sinks;
      const done = contents.ids;
      const toDo = inShard === undefined ? undefined : Math.max(0, inShard - done.size);
      const tally: RunTally = { recorded: 0, ok: 0, failed: 0, resumed: 0, otherShards: 0, duplicates: 0, failureExamples: [], duplicateExamples: [] };
      const started = options.now();
      const progress = (): BatchProgress => ({
        recorded: tally.recorded,
        ok: tally.ok,
        failed: tally.failed,
        resumed: tally.resumed,
        toDo,
        elapsedMs: options.now() - started,
      });
      const record = (row: ResultRow): void => {
        recordRow(rowSinks, tally, row);
        options.onProgress?.(progress());
      };

      options.onProgress?.(progress());
      try {
        await fitEveryObject(options, pool, done, tally, record);
      } finally {
        await pool.close();
      }
      await sinks.csv?.close();
      sinks.csv = undefined;
      await journal.close();
      await writeFinalTable(options, journalPath, opened.columns, sinks.csvNeedsRebuild);

      const final = progress();
      return {
        ...final,
        toDo,
        totalOk: contents.ok + tally.ok,
        totalFailed: contents.failed + tally.failed,
        otherShards: tally.otherShards,
        duplicates: tally.duplicates,
        duplicateExamples: tally.duplicateExamples,
        failureExamples: tally.failureExamples,
        repairedBytes: contents.repairedBytes,
        out: options.out,
        journal: journalPath,
      };
    } finally {
      await sinks?.csv?.close();
      await journal.close();
    }
  } finally {
    lock.release();
  }
}
