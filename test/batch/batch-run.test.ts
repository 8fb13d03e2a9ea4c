import { mkdtempSync, readFileSync, rmSync, truncateSync, writeFileSync, existsSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { asyncBufferFromFile, parquetReadObjects } from "hyparquet";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runBatch, type BatchRunOptions } from "../../src/batch/batch-run.js";
import { objectSeed } from "../../src/batch/object-seed.js";
import { okRow, type ResultRow } from "../../src/batch/result-row.js";
import { journalPathFor, journalRows } from "../../src/batch/results-journal.js";
import { readResultsTable } from "../../src/batch/results-table-reader.js";
import { isInShard } from "../../src/batch/shard.js";
import { fixtureModule, requireFreshBuild } from "./build-check.js";
import { inventedCatalogue, inventedIds, inventedLightCurve, type Sentinels } from "./invented-catalogue.js";
// The stand-in fit itself, to compute in-process what the workers should have recorded.
// @ts-expect-error a plain JavaScript fixture without type declarations
import { fitLightCurve as standInFit } from "./fixtures/summary-fit.mjs";

let folder: string;
beforeAll(() => {
  requireFreshBuild();
  folder = mkdtempSync(join(tmpdir(), "horologium-batch-run-"));
});
afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

const RUN_SEED = 20261;

function options(name: string, ids: readonly string[], extra: Partial<BatchRunOptions> = {}, sentinels: Sentinels = {}): BatchRunOptions {
  return {
    objects: inventedCatalogue(ids, sentinels),
    listIds: async function* () {
      yield* ids;
    },
    inputDescription: "invented lanternfield catalogue",
    out: join(folder, name),
    format: name.endsWith(".parquet") ? "parquet" : "csv",
    model: "drw",
    seed: RUN_SEED,
    shard: { index: 0, count: 1 },
    workers: 2,
    fitModule: fixtureModule("summary-fit.mjs"),
    mode: "new",
    now: () => Date.now(),
    ...extra,
  };
}

async function rows(path: string): Promise<ResultRow[]> {
  const all: ResultRow[] = [];
  for await (const row of readResultsTable(path)) all.push(row);
  return all;
}

function byId(list: readonly ResultRow[]): Map<string, ResultRow> {
  return new Map(list.map((row) => [row.object_id as string, row]));
}

/** Checks a row read back from a table against the expected row: equal cells, and empty cells elsewhere. */
function expectRow(row: ResultRow | undefined, expected: ResultRow): void {
  expect(row).toBeDefined();
  for (const [column, value] of Object.entries(row!)) {
    expect(value, `${expected.object_id} ${column}`).toEqual(column in expected ? expected[column] : null);
  }
  for (const column of Object.keys(expected)) expect(row, `${expected.object_id} ${column}`).toHaveProperty([column]);
}

/** The row the stand-in fit gives for an object, computed in this process, as it reads back from CSV. */
function expectedRow(id: string): ResultRow {
  const seed = objectSeed(RUN_SEED, id);
  const fit = standInFit(inventedLightCurve(id, 30), { model: "drw", seed });
  return okRow(id, seed, fit);
}

describe("runBatch", () => {
  it("fits every object once on worker threads, and records failures with their reasons without stopping", async () => {
    const ids = inventedIds(24);
    const sentinels = { failing: ["lf-005"], crashing: ["lf-011"], unreadable: ["lf-017"] };
    const summary = await runBatch(options("all.csv", ids, {}, sentinels));
    expect(summary).toMatchObject({ recorded: 24, ok: 21, failed: 3, toDo: 24, resumed: 0, duplicates: 0 });

    const table = await rows(join(folder, "all.csv"));
    expect(table.map((row) => row.object_id).sort()).toEqual(ids);
    const found = byId(table);
    expect(found.get("lf-005")).toMatchObject({ status: "failed", reason: "the stand-in fit rejects this object on purpose" });
    expect(String(found.get("lf-011")!.reason)).toMatch(/worker thread stopped during the fit \(exit code 7\)/);
    expect(found.get("lf-017")).toMatchObject({ status: "failed", reason: `lf-017.csv:4: column "mag": 'abc' is not a number` });
    for (const id of ids.filter((id) => !["lf-005", "lf-011", "lf-017"].includes(id))) {
      const row = found.get(id)!;
      const expected = expectedRow(id);
      expectRow(row, expected);
      // The parameter summaries of the fit JSON are flattened to <parameter>.<statistic> columns.
      expect(row["mean.median"]).toBe(expected["mean.median"]);
      expect(row["diagnostics.autocorrelationTime"]).toBeNaN();
    }
  });

  it("gives the same results whatever the order of the input, the number of workers and the shard", async () => {
    const ids = inventedIds(18);
    await runBatch(options("forward.csv", ids, { workers: 2 }));
    await runBatch(options("reversed.csv", [...ids].reverse(), { workers: 1 }));
    const shardFiles = [0, 1, 2].map((k) => `shard-${k}.csv`);
    for (const [k, name] of shardFiles.entries()) {
      await runBatch(options(name, ids, { shard: { index: k, count: 3 } }));
    }
    const forward = byId(await rows(join(folder, "forward.csv")));
    const reversed = byId(await rows(join(folder, "reversed.csv")));
    const shardRows = (await Promise.all(shardFiles.map((name) => rows(join(folder, name))))).flat();
    expect(shardRows).toHaveLength(18); // every object in exactly one shard
    expect(reversed).toEqual(forward);
    expect(byId(shardRows)).toEqual(forward);
    for (const [k, name] of shardFiles.entries()) {
      for (const row of await rows(join(folder, name))) expect(isInShard(row.object_id as string, { index: k, count: 3 })).toBe(true);
    }
  });

  it("resumes after a crash that tore the last journal line, redoing only unfinished objects, without duplicates", async () => {
    const ids = inventedIds(20);
    const out = join(folder, "torn.csv");
    await runBatch(options("torn.csv", ids.slice(0, 12)));
    // Simulate a kill in the middle of appending a row: cut the journal in the middle of its last line,
    // and leave the CSV with a half-written line too.
    const journal = journalPathFor(out);
    const size = statSync(journal).size;
    truncateSync(journal, size - 25);
    writeFileSync(out, readFileSync(out, "utf8") + "lf-0", { flag: "w" });
    const summary = await runBatch(options("torn.csv", ids, { mode: "resume" }));
    expect(summary.resumed).toBe(11);
    expect(summary.recorded).toBe(9);
    expect(summary.repairedBytes).toBeGreaterThan(0);
    const table = await rows(out);
    expect(table.map((row) => row.object_id).sort()).toEqual(ids);
    const journalled: ResultRow[] = [];
    for await (const row of journalRows(journal)) journalled.push(row);
    expect(journalled.map((row) => row.object_id).sort()).toEqual(ids);
    for (const id of ids) expectRow(byId(table).get(id), expectedRow(id));
  });

  it("refuses to overwrite earlier results unless asked, and to resume with different options", async () => {
    const ids = inventedIds(3);
    await runBatch(options("guarded.csv", ids));
    await expect(runBatch(options("guarded.csv", ids))).rejects.toThrow(/guarded\.csv exists: pass --resume to continue its run, or --overwrite/);
    await expect(runBatch(options("guarded.csv", ids, { mode: "resume", seed: 99 }))).rejects.toThrow(
      /seed was "20261", now "99"/,
    );
    writeFileSync(join(folder, "precious.csv"), "someone else's table\n");
    await expect(runBatch(options("precious.csv", ids))).rejects.toThrow(/precious\.csv exists: pass --resume/);
    const again = await runBatch(options("guarded.csv", ids, { mode: "overwrite" }));
    expect(again.recorded).toBe(3);
    expect(existsSync(join(folder, "guarded.csv.lock"))).toBe(false);
  });

  it("stops a fit that exceeds the time limit and records it as failed", async () => {
    const ids = inventedIds(4);
    const summary = await runBatch(options("slow.csv", ids, { timeoutSeconds: 1 }, { hanging: ["lf-002"] }));
    expect(summary).toMatchObject({ ok: 3, failed: 1 });
    const found = byId(await rows(join(folder, "slow.csv")));
    expect(found.get("lf-002")).toMatchObject({ status: "failed", reason: "no result within the time limit of 1 s" });
  });

  it("records an object whose fit exhausts the worker's memory as failed, and goes on", async () => {
    const ids = inventedIds(4);
    const summary = await runBatch(options("hoard.csv", ids, { memoryLimitMb: 48 }, { hoarding: ["lf-001"] }));
    expect(summary).toMatchObject({ ok: 3, failed: 1 });
    const found = byId(await rows(join(folder, "hoard.csv")));
    expect(String(found.get("lf-001")!.reason)).toMatch(/worker thread stopped during the fit \(.*memory limit/);
  });

  it("writes Parquet that an independent reader (hyparquet) reads back to the same values", async () => {
    const ids = inventedIds(8);
    await runBatch(options("table.parquet", ids, {}, { failing: ["lf-003"] }));
    const file = await asyncBufferFromFile(join(folder, "table.parquet"));
    const objects = await parquetReadObjects({ file });
    expect(objects).toHaveLength(8);
    for (const object of objects) {
      const id = object.object_id as string;
      if (id === "lf-003") {
        expect(object.status).toBe("failed");
        expect(object["mean.median"]).toBeNull();
        continue;
      }
      const expected = expectedRow(id);
      expect(object["mean.median"]).toBe(expected["mean.median"]);
      expect(object["sigma.q97.5"]).toBe(expected["sigma.q97.5"]);
      expect(object["diagnostics.converged"]).toBe(true);
      expect(object.seed).toBe(objectSeed(RUN_SEED, id));
      expect(object.warnings).toBe("[]");
    }
  });

  it("stops with a clear message when the fit module cannot be used", async () => {
    await expect(
      runBatch(options("broken.csv", inventedIds(2), { fitModule: fixtureModule("unloadable-fit.mjs") })),
    ).rejects.toThrow(/cannot load the fit module .*unloadable-fit\.mjs: it does not export a function fitLightCurve/);
  });

  it("records an object as failed, naming the field, when the fit module returns a malformed result", async () => {
    const summary = await runBatch(options("malformed.csv", inventedIds(2), { fitModule: fixtureModule("malformed-fit.mjs") }));
    expect(summary).toMatchObject({ ok: 0, failed: 2 });
    for (const row of await rows(join(folder, "malformed.csv")))
      expect(row.reason).toMatch(/^the result of .*malformed-fit\.mjs: field "data" must be an object, got nothing/);
  });
});
