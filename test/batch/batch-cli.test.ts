import { execFileSync, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parquetWriteBuffer } from "hyparquet-writer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readResultsTable } from "../../src/batch/results-table-reader.js";
import type { ResultRow } from "../../src/batch/result-row.js";
import { isInShard } from "../../src/batch/shard.js";
import { PROJECT_ROOT, requireFreshBuild } from "./build-check.js";
import { writeInventedFolder } from "./invented-folder.js";

const FIT = join(PROJECT_ROOT, "test", "batch", "fixtures", "summary-fit.mjs");
let folder: string;
let catalogue: string;
let ids: string[];

beforeAll(async () => {
  requireFreshBuild();
  folder = mkdtempSync(join(tmpdir(), "horologium-batch-cli-"));
  catalogue = join(folder, "lanternfield");
  ids = await writeInventedFolder(catalogue, 16, { failing: ["lf-004"], unreadable: ["lf-009"] });
});
afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

/**
 * Runs the compiled command line in a child process, in the test folder, with the given environment
 * on top of this one minus any Slurm variables (the shard must come only from what a test sets).
 */
async function cli(args: string[], env: Record<string, string> = {}): Promise<{ code: number; stdout: string; stderr: string }> {
  const base = Object.fromEntries(Object.entries(process.env).filter(([name]) => !name.startsWith("SLURM_")));
  const result = spawnSync(process.execPath, [join(PROJECT_ROOT, "dist", "src", "cli", "bin.js"), ...args], {
    cwd: folder,
    env: { ...base, ...env },
    encoding: "utf8",
  });
  return { code: result.status ?? -1, stdout: result.stdout, stderr: result.stderr };
}

async function table(path: string): Promise<Map<string, ResultRow>> {
  const rows = new Map<string, ResultRow>();
  for await (const row of readResultsTable(path)) {
    expect(rows.has(row.object_id as string)).toBe(false);
    rows.set(row.object_id as string, row);
  }
  return rows;
}

const fitArgs = ["--model", "drw", "--seed", "3", "--fit-module", FIT];

describe("horologium batch", () => {
  it("has help with an example, for the run and both sub-verbs", async () => {
    for (const args of [["batch", "--help"], ["batch", "plan", "--help"], ["batch", "merge", "--help"]]) {
      const { code, stdout } = await cli(args);
      expect(code).toBe(0);
      expect(stdout).toMatch(/^Usage: horologium batch/);
      expect(stdout).toContain("Example");
    }
  });

  it("rejects bad command lines with one line and exit status 2", async () => {
    const cases: [string[], RegExp][] = [
      [["batch", "lanternfield", "--out", "x.csv"], /--model is required/],
      [["batch", "lanternfield", "--model", "drw"], /--out is required/],
      [["batch", "lanternfield", "--model", "drw", "--out", "x.txt"], /must end in \.csv or \.parquet/],
      [["batch", "lanternfield", "--model", "drw", "--out", "x.csv", "--shard", "3/3"], /K runs from 0 to N-1/],
      [["batch", "lanternfield", "--model", "drw", "--out", "x.csv", "--frobnicate"], /unknown option --frobnicate/],
      [["batch", "nowhere", "--model", "drw", "--out", "x.csv"], /nowhere: no such file or folder/],
      [["batch", "lanternfield/lf-000.csv", "--model", "drw", "--out", "x.csv"], /is a file: name its object-id column with --id-col/],
      [["batch", "lanternfield", ...fitArgs.slice(0, 4), "--fit-module", "missing.mjs", "--out", "x.csv"], /cannot load the fit module/],
    ];
    writeFileSync(join(folder, "tiny-table.csv"), "objid,mjd,mag,mag_err\nlf-1,1,19,0.1\n");
    cases.push([["batch", "tiny-table.csv", "--id-col", "nope", "--model", "drw", "--out", "x.csv"], /tiny-table\.csv: no object-id column "nope"/]);
    for (const [args, message] of cases) {
      const { code, stderr } = await cli(args);
      expect(code, args.join(" ")).toBe(2);
      expect(stderr, stderr).toMatch(message);
      expect(stderr.trim().split("\n")).toHaveLength(1);
    }
    // Nothing was written by the refused runs.
    expect(existsSync(join(folder, "x.csv"))).toBe(false);
    expect(existsSync(join(folder, "x.csv.journal.jsonl"))).toBe(false);
  });

  it("fits a folder, recording unreadable and failing objects with their reasons", async () => {
    const { code, stderr } = await cli(["batch", "lanternfield", ...fitArgs, "--workers", "2", "--out", "all.csv"]);
    expect(code, stderr).toBe(0);
    expect(stderr).toContain("batch: 14 fitted, 2 failed");
    expect(stderr).toMatch(/failed lf-009: .*lf-009\.csv:3: column "mag"/);
    const rows = await table(join(folder, "all.csv"));
    expect([...rows.keys()].sort()).toEqual(ids);
    expect(rows.get("lf-004")).toMatchObject({ status: "failed", reason: "the stand-in fit rejects this object on purpose" });
  });

  it("fits a single table grouped by an object-id column, with the same results as one file per object", async () => {
    // The same invented light curves as one table, rows grouped by object id; lf-009 has a bad cell.
    const lines = ["objid,mjd,mag,mag_err"];
    for (const id of ids) {
      const file = readFileSync(join(catalogue, `${id}.csv`), "utf8").trim().split("\n").slice(1);
      for (const line of file) lines.push(`${id},${line}`);
    }
    writeFileSync(join(folder, "lanternfield-table.csv"), lines.join("\n") + "\n");
    await expectSameAsFolder("lanternfield-table.csv", /^object "lf-009": .*lanternfield-table\.csv:\d+: column "mag"/);
  });

  it("fits a Parquet table grouped by an object-id column, with the same results as the folder", async () => {
    // The same rows as the table above, written by hyparquet-writer with row groups of 50 rows (objects
    // straddle row groups); the magnitudes as strings so that lf-009's bad cell survives.
    const rows = readFileSync(join(folder, "lanternfield-table.csv"), "utf8").trim().split("\n").slice(1).map((line) => line.split(","));
    const columnData = [
      { name: "objid", data: rows.map((r) => r[0]), type: "STRING" },
      { name: "mjd", data: rows.map((r) => Number(r[1])), type: "DOUBLE" },
      { name: "mag", data: rows.map((r) => r[2]), type: "STRING" },
      { name: "mag_err", data: rows.map((r) => Number(r[3])), type: "DOUBLE" },
    ];
    writeFileSync(join(folder, "lanternfield-table.parquet"), new Uint8Array(parquetWriteBuffer({ columnData: columnData as never, rowGroupSize: 50 })));
    await expectSameAsFolder("lanternfield-table.parquet", /^object "lf-009": .*lanternfield-table\.parquet: row \d+: column "mag"/);
  });

  /** Fits a table of the whole catalogue: every object as fitted from the folder, lf-009's bad cell as `badCell`. */
  async function expectSameAsFolder(tableName: string, badCell: RegExp): Promise<void> {
    const out = `from-${tableName}.csv`;
    const { code, stderr } = await cli(["batch", tableName, "--id-col", "objid", ...fitArgs, "--out", out]);
    expect(code, stderr).toBe(0);
    const fromTable = await table(join(folder, out));
    const fromFolder = await table(join(folder, "all.csv"));
    expect([...fromTable.keys()].sort()).toEqual(ids);
    for (const id of ids) {
      if (id === "lf-009") expect(fromTable.get(id)!.reason).toMatch(badCell);
      else expect(fromTable.get(id)).toEqual(fromFolder.get(id));
    }
  }

  it("takes its shard from the Slurm job-array variables", async () => {
    const env = { SLURM_ARRAY_TASK_ID: "1", SLURM_ARRAY_TASK_COUNT: "3" };
    const { code, stderr } = await cli(["batch", "lanternfield", ...fitArgs, "--workers", "1", "--out", "task1.csv"], env);
    expect(code, stderr).toBe(0);
    expect(stderr).toContain("shard 1/3 (from SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT)");
    const rows = await table(join(folder, "task1.csv"));
    expect(rows.size).toBe(ids.filter((id) => isInShard(id, { index: 1, count: 3 })).length);
    for (const id of rows.keys()) expect(isInShard(id, { index: 1, count: 3 })).toBe(true);
  });

  it("plans a job array whose tasks, run one by one with bash, merge into the single-process results", async () => {
    const single = join(folder, "single.csv");
    expect((await cli(["batch", "lanternfield", ...fitArgs, "--workers", "2", "--out", single, "--quiet"])).code).toBe(0);

    const planned = await cli(["batch", "plan", "lanternfield", ...fitArgs, "--shards", "3", "--out-dir", "array", "--cpus-per-task", "2", "--time-limit", "00:30:00"]);
    expect(planned.code, planned.stderr).toBe(0);
    const scriptPath = join(folder, "array", "batch-job.sh");
    const script = readFileSync(scriptPath, "utf8");
    expect(script).toContain("#SBATCH --array=0-2\n");
    expect(script).toContain("#SBATCH --cpus-per-task=2\n");
    expect(script).toContain("#SBATCH --time=00:30:00\n");
    expect(script).toContain(`#SBATCH --output=${join(folder, "array")}/logs/shard-%a.log`);
    execFileSync("bash", ["-n", scriptPath]); // bash itself checks the syntax

    // Run each array task as Slurm would, minus Slurm: the same script with the task's variables.
    for (const task of [0, 1, 2]) {
      execFileSync("bash", [scriptPath], {
        env: { ...process.env, SLURM_ARRAY_TASK_ID: String(task), SLURM_ARRAY_TASK_COUNT: "3", SLURM_CPUS_PER_TASK: "1" },
        stdio: "pipe",
      });
    }
    // With one shard missing, merge says which shard and which objects, and exits 3.
    const partial = await cli(["batch", "merge", "array/shard-0.csv", "array/shard-2.csv", "--catalogue", "lanternfield", "--missing-list", "missing.txt", "--out", "partial.csv"]);
    expect(partial.code).toBe(3);
    expect(partial.stdout).toContain("missing shard(s) of 3: 1");
    const missing = readFileSync(join(folder, "missing.txt"), "utf8").trim().split("\n").sort();
    expect(missing).toEqual(ids.filter((id) => isInShard(id, { index: 1, count: 3 })));

    const merged = await cli(["batch", "merge", "array/shard-0.csv", "array/shard-1.csv", "array/shard-2.csv", "--catalogue", "lanternfield", "--out", "merged.parquet"]);
    expect(merged.code, merged.stdout).toBe(0);
    expect(merged.stdout).toContain("16 objects, 14 ok, 2 failed");
    expect(merged.stdout).toContain("every object of the catalogue is in the table");
    const expected = await table(single);
    const actual = await table(join(folder, "merged.parquet"));
    expect(actual).toEqual(expected);
  });

  it("refuses to merge tables of different runs", async () => {
    expect((await cli(["batch", "lanternfield", ...fitArgs, "--out", "seed3.csv", "--quiet"])).code).toBe(0);
    const other = ["--model", "drw", "--seed", "4", "--fit-module", FIT];
    expect((await cli(["batch", "lanternfield", ...other, "--out", "seed4.csv", "--quiet"])).code).toBe(0);
    const { code, stderr } = await cli(["batch", "merge", "seed3.csv", "seed4.csv", "--out", "mixed.csv"]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/seed4\.csv: fitted with seed "4", but .*seed3\.csv with "3": these are not shards of one run/);
  });
});
