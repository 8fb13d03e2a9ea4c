import { closeSync, existsSync, ftruncateSync, openSync } from "node:fs";
import { dirname } from "node:path";
import { UsageError } from "../errors/usage-error.js";
import { InputError } from "../errors/input-error.js";
import { DurableAppender, syncDirectory } from "./durable-file.js";
import { fileLines } from "./file-lines.js";
import { decodeJournalRow, encodeJournalRow } from "./journal-codec.js";
import type { ResultRow } from "./result-row.js";

/**
 * What defines a batch run for the purpose of resuming it: model, run seed, shard, fit options, ...
 * A journal can be resumed only by a run with the same identity, so that resumed results are the
 * results the interrupted run would have written.
 */
export type RunIdentity = Readonly<Record<string, string | number | boolean | null>>;

/** How to treat an existing journal. */
export type JournalOpenMode = "new" | "resume" | "overwrite";

/** What an existing journal already holds when a run resumes. */
export interface JournalContents {
  /** Ids of the objects already recorded (ok or failed); they are not fitted again. */
  readonly ids: Set<string>;
  readonly ok: number;
  readonly failed: number;
  /** Column names seen in the recorded rows, in order of first appearance. */
  readonly columns: readonly string[];
  /** Bytes of a torn last line (a write cut short by a crash) that were cut off; 0 for a clean journal. */
  readonly repairedBytes: number;
}

const JOURNAL_TAG = "horologiumBatchJournal";
const JOURNAL_VERSION = 1;

/** The journal that goes with a results file: `<out>.journal.jsonl`. */
export function journalPathFor(outputPath: string): string {
  return `${outputPath}.journal.jsonl`;
}

/**
 * The record of a batch run: a JSON Lines file whose first line states the run's identity and every
 * further line is one object's result row, written as soon as the object is done and flushed to
 * storage (fdatasync) in the background (see {@link DurableAppender}). It is the single source of
 * truth from which the CSV or Parquet table is (re)built, so a run killed at any moment, even by
 * SIGKILL or a power cut, resumes exactly: a line cut short by the crash is removed, and every whole
 * line is an object that is not fitted again.
 */
export class ResultsJournal {
  private constructor(
    /** The journal's path. */
    readonly path: string,
    private readonly file: DurableAppender,
  ) {}

  /**
   * Opens (mode "resume"), starts (mode "new"; refuses to replace an existing journal) or restarts (mode
   * "overwrite") the journal at `path`. Resuming checks that the identity matches the one recorded.
   */
  static async open(
    path: string,
    identity: RunIdentity,
    mode: JournalOpenMode,
  ): Promise<{ journal: ResultsJournal; contents: JournalContents }> {
    const empty: JournalContents = { ids: new Set(), ok: 0, failed: 0, columns: [], repairedBytes: 0 };
    if (existsSync(path) && mode === "new") {
      throw new UsageError(
        `${path} exists from an earlier run: pass --resume to continue it, or --overwrite to start again`,
      );
    }
    if (mode === "resume" && existsSync(path)) {
      const scanned = await scanJournal(path, identity);
      if (scanned) {
        const fd = openSync(path, "r+");
        if (scanned.validBytes < scanned.totalBytes) ftruncateSync(fd, scanned.validBytes);
        closeSync(fd);
        return { journal: new ResultsJournal(path, new DurableAppender(path)), contents: scanned.contents };
      }
      // The header itself was cut short: nothing was recorded, so start afresh.
    }
    const file = new DurableAppender(path, true);
    file.append(JSON.stringify({ [JOURNAL_TAG]: JOURNAL_VERSION, run: identity }) + "\n");
    syncDirectory(dirname(path));
    return { journal: new ResultsJournal(path, file), contents: empty };
  }

  /** Records one object's row: written at once, on storage within about one background flush. */
  append(row: ResultRow): void {
    this.file.append(encodeJournalRow(row) + "\n");
  }

  /** Flushes every row to storage and closes the file; further appends throw. */
  async close(): Promise<void> {
    await this.file.close();
  }
}

/**
 * Streams the rows recorded in a journal (without its header), in the order they were recorded.
 * A torn last line is skipped, as {@link ResultsJournal.open} would cut it off.
 */
export async function* journalRows(path: string): AsyncGenerator<ResultRow> {
  for await (const line of fileLines(path)) {
    if (line.number === 1 || !line.terminated || line.text === "") continue;
    yield parseRowLine(path, line.number, line.text);
  }
}

/** Reads the identity recorded in a journal's first line, or undefined when the journal has none yet. */
export async function journalIdentity(path: string): Promise<RunIdentity | undefined> {
  for await (const line of fileLines(path)) {
    if (!line.terminated) return undefined;
    return parseHeader(path, line.text);
  }
  return undefined;
}

async function scanJournal(
  path: string,
  identity: RunIdentity,
): Promise<{ contents: JournalContents; validBytes: number; totalBytes: number } | undefined> {
  const ids = new Set<string>();
  const columns: string[] = [];
  const knownColumns = new Set<string>();
  let ok = 0;
  let failed = 0;
  let validBytes = 0;
  let totalBytes = 0;
  for await (const line of fileLines(path)) {
    totalBytes = line.end;
    if (!line.terminated) break; // a torn last line: cut off below
    if (line.number === 1) {
      checkIdentity(path, parseHeader(path, line.text), identity);
    } else if (line.text !== "") {
      const row = parseRowLine(path, line.number, line.text);
      const id = row.object_id as string;
      if (ids.has(id)) {
        throw new InputError(`object "${id}" is recorded twice; the journal was written by two runs at once`, {
          file: path,
          line: line.number,
        });
      }
      ids.add(id);
      if (row.status === "ok") ok += 1;
      else failed += 1;
      for (const column of Object.keys(row)) {
        if (!knownColumns.has(column)) {
          knownColumns.add(column);
          columns.push(column);
        }
      }
    }
    validBytes = line.end;
  }
  if (validBytes === 0) return undefined;
  return { contents: { ids, ok, failed, columns, repairedBytes: totalBytes - validBytes }, validBytes, totalBytes };
}

function parseHeader(path: string, text: string): RunIdentity {
  let header: unknown;
  try {
    header = JSON.parse(text);
  } catch {
    header = undefined;
  }
  const record = header as Record<string, unknown> | undefined;
  if (!record || record[JOURNAL_TAG] !== JOURNAL_VERSION || typeof record.run !== "object" || record.run === null) {
    throw new InputError(`not a batch journal of this version (first line is not a ${JOURNAL_TAG} header)`, {
      file: path,
      line: 1,
    });
  }
  return record.run as RunIdentity;
}

function parseRowLine(path: string, number: number, text: string): ResultRow {
  try {
    return decodeJournalRow(text);
  } catch (error) {
    throw new InputError(`damaged journal line (${(error as Error).message})`, { file: path, line: number });
  }
}

function checkIdentity(path: string, recorded: RunIdentity, wanted: RunIdentity): void {
  const keys = new Set([...Object.keys(recorded), ...Object.keys(wanted)]);
  const differences: string[] = [];
  for (const key of keys) {
    const before = recorded[key] ?? null;
    const now = wanted[key] ?? null;
    if (before !== now) differences.push(`${key} was ${JSON.stringify(before)}, now ${JSON.stringify(now)}`);
  }
  if (differences.length > 0) {
    throw new UsageError(
      `cannot resume ${path}: it was written by a different run (${differences.join("; ")}); ` +
        "use the original options, another --out, or --overwrite",
    );
  }
}
