import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { journalPathFor } from "../../src/batch/results-journal.js";
import { readResultsTable } from "../../src/batch/results-table-reader.js";
import type { ResultRow } from "../../src/batch/result-row.js";
import { PROJECT_ROOT, requireFreshBuild } from "./build-check.js";
import { writeInventedFolder } from "./invented-folder.js";

const CLI = join(PROJECT_ROOT, "dist", "src", "cli", "bin.js");
const FIT = join(PROJECT_ROOT, "test", "batch", "fixtures", "summary-fit.mjs");

let folder: string;
let ids: string[];
beforeAll(async () => {
  requireFreshBuild();
  folder = mkdtempSync(join(tmpdir(), "horologium-kill-"));
  ids = await writeInventedFolder(join(folder, "catalogue"), 40, { failing: ["lf-013"] });
});
afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

function batchArgs(out: string, ...extra: string[]): string[] {
  return [CLI, "batch", join(folder, "catalogue"), "--model", "drw", "--seed", "5", "--workers", "2", "--fit-module", FIT, "--out", out, ...extra];
}

async function table(path: string): Promise<ResultRow[]> {
  const rows: ResultRow[] = [];
  for await (const row of readResultsTable(path)) rows.push(row);
  return rows;
}

function journalLines(out: string): number {
  const path = journalPathFor(out);
  return existsSync(path) ? readFileSync(path, "utf8").split("\n").filter(Boolean).length - 1 : 0;
}

/** Starts a slow run and SIGKILLs it once the journal holds at least `after` rows. */
async function killMidway(out: string, after: number, extra: string[]): Promise<number> {
  const child = spawn(process.execPath, batchArgs(out, ...extra), {
    env: { ...process.env, HOROLOGIUM_TEST_FIT_DELAY_MS: "150" },
    stdio: "ignore",
  });
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
  const deadline = Date.now() + 60_000;
  while (journalLines(out) < after) {
    if (Date.now() > deadline) throw new Error("the run did not progress");
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
  child.kill("SIGKILL");
  await exited;
  return journalLines(out);
}

describe("a run killed with SIGKILL", () => {
  it("is finished by --resume, redoing only unfinished objects, with no duplicates, equal to an uninterrupted run", async () => {
    const reference = join(folder, "reference.csv");
    expect(spawnSync(process.execPath, batchArgs(reference, "--quiet")).status).toBe(0);

    const out = join(folder, "interrupted.csv");
    const first = await killMidway(out, 6, []);
    expect(first).toBeGreaterThanOrEqual(6);
    expect(first).toBeLessThan(40);
    const second = await killMidway(out, first + 6, ["--resume"]);
    expect(second).toBeGreaterThan(first);
    expect(second).toBeLessThan(40);

    const resumed = spawnSync(process.execPath, batchArgs(out, "--resume"), { encoding: "utf8" });
    expect(resumed.status, resumed.stderr).toBe(0);
    expect(resumed.stderr).toContain(`already done by the interrupted run`);
    expect(resumed.stderr).toContain(`40 objects in ${out} (39 ok, 1 failed)`);

    const rows = await table(out);
    expect(rows.map((row) => row.object_id).sort()).toEqual(ids);
    const expected = new Map((await table(reference)).map((row) => [row.object_id, row]));
    for (const row of rows) expect(row).toEqual(expected.get(row.object_id));
    expect(journalLines(out)).toBe(40);
  });
});
