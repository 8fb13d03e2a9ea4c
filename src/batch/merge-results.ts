import { existsSync } from "node:fs";
import { InputError } from "../errors/input-error.js";
import { writeCsvTable } from "./csv-results-file.js";
import { ColumnTypeTracker, writeParquetTable } from "./parquet-results-file.js";
import { orderColumns, unionColumns } from "./result-columns.js";
import type { ResultRow } from "./result-row.js";
import { journalIdentity, journalPathFor, type RunIdentity } from "./results-journal.js";
import { readResultsTable } from "./results-table-reader.js";
import type { ResultsFormat } from "./batch-run.js";
import { parseShard } from "./shard.js";

/** Options of {@link mergeResults}. */
export interface MergeOptions {
  /** The shard results tables (CSV or Parquet). */
  readonly inputs: readonly string[];
  readonly out: string;
  readonly format: ResultsFormat;
  /** The catalogue's ids, to find objects that no shard recorded. */
  readonly catalogueIds?: () => AsyncIterable<string>;
  /** Called with the id of every missing object (for a full list; the report keeps only examples). */
  readonly onMissing?: (id: string) => void;
}

/** What a merge found. */
export interface MergeReport {
  readonly inputs: number;
  /** Rows written to the merged table. */
  readonly rows: number;
  readonly ok: number;
  readonly failed: number;
  /** The first failed objects with their reasons (all are in the table). */
  readonly failureExamples: readonly { readonly id: string; readonly reason: string }[];
  /** Objects found in more than one input; the first occurrence is kept. */
  readonly duplicates: number;
  readonly duplicateExamples: readonly string[];
  /** Objects of the catalogue found in no input (only when the catalogue was given). */
  readonly missing?: number;
  readonly missingExamples: readonly string[];
  /** Shard numbers absent from a set of shards K/N, when the inputs' journals tell which they are. */
  readonly missingShards: readonly number[];
  /** The shard count N, when every input's journal names one. */
  readonly shardCount?: number;
}

const EXAMPLES = 20;

/**
 * Joins the results tables of the shards of a job array into one table (written atomically, CSV or
 * Parquet) and reports what is incomplete: failed objects, objects recorded twice, objects of the
 * catalogue that no shard recorded, and shards missing from the set. When the journals written beside
 * the shard tables are present, it also checks that every shard was fitted with the same model, seed,
 * input and options, and refuses to mix runs that were not. Rows are streamed (two passes), so memory
 * holds only the set of ids.
 */
export async function mergeResults(options: MergeOptions): Promise<MergeReport> {
  const identities = await checkIdentities(options.inputs);

  let columns: readonly string[] = [];
  const types = new ColumnTypeTracker();
  const ids = new Set<string>();
  let duplicates = 0;
  const duplicateExamples: string[] = [];
  for (const input of options.inputs) {
    for await (const row of readResultsTable(input)) {
      columns = unionColumns(columns, row);
      types.observe(row);
      const id = row.object_id as string;
      if (ids.has(id)) {
        duplicates += 1;
        if (duplicateExamples.length < EXAMPLES) duplicateExamples.push(id);
      }
      ids.add(id);
    }
  }

  let ok = 0;
  let failed = 0;
  const failureExamples: { id: string; reason: string }[] = [];
  const emitted = new Set<string>();
  const inputs = options.inputs;
  async function* firstOccurrences(): AsyncGenerator<ResultRow> {
    for (const input of inputs) {
      for await (const row of readResultsTable(input)) {
        const id = row.object_id as string;
        if (emitted.has(id)) continue;
        emitted.add(id);
        if (row.status === "ok") ok += 1;
        else {
          failed += 1;
          if (failureExamples.length < EXAMPLES) failureExamples.push({ id, reason: String(row.reason ?? "") });
        }
        yield row;
      }
    }
  }
  columns = columns.length === 0 ? ["object_id", "status", "reason", "model", "seed"] : orderColumns(columns);
  const rows =
    options.format === "parquet"
      ? await writeParquetTable(options.out, columns, types, firstOccurrences())
      : await writeCsvTable(options.out, columns, firstOccurrences());

  let missing: number | undefined;
  const missingExamples: string[] = [];
  if (options.catalogueIds) {
    missing = 0;
    const counted = new Set<string>();
    for await (const id of options.catalogueIds()) {
      if (emitted.has(id) || counted.has(id)) continue;
      counted.add(id);
      missing += 1;
      options.onMissing?.(id);
      if (missingExamples.length < EXAMPLES) missingExamples.push(id);
    }
  }

  return {
    inputs: options.inputs.length,
    rows,
    ok,
    failed,
    failureExamples,
    duplicates,
    duplicateExamples,
    missing,
    missingExamples,
    ...identities,
  };
}

async function checkIdentities(inputs: readonly string[]): Promise<{ missingShards: number[]; shardCount?: number }> {
  let reference: { input: string; identity: RunIdentity } | undefined;
  const shards = new Set<number>();
  let count: number | undefined;
  let everyInputKnown = inputs.length > 0;
  for (const input of inputs) {
    const journal = journalPathFor(input);
    const identity = existsSync(journal) ? await journalIdentity(journal) : undefined;
    if (!identity) {
      everyInputKnown = false;
      continue;
    }
    if (reference) {
      for (const key of new Set([...Object.keys(identity), ...Object.keys(reference.identity)])) {
        if (key === "shard") continue;
        const here = identity[key] ?? null;
        const there = reference.identity[key] ?? null;
        if (here !== there) {
          throw new InputError(
            `fitted with ${key} ${JSON.stringify(here)}, but ${reference.input} with ${JSON.stringify(there)}: ` +
              "these are not shards of one run",
            { file: input },
          );
        }
      }
    } else {
      reference = { input, identity };
    }
    const shard = parseShard(String(identity.shard ?? "0/1"));
    if (count !== undefined && shard.count !== count) {
      throw new InputError(`is shard ${shard.index}/${shard.count}, but other inputs are shards of ${count}`, {
        file: input,
      });
    }
    count = shard.count;
    shards.add(shard.index);
  }
  if (!everyInputKnown || count === undefined) return { missingShards: [] };
  const missingShards: number[] = [];
  for (let k = 0; k < count; k++) if (!shards.has(k)) missingShards.push(k);
  return { missingShards, shardCount: count };
}
