import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { hostname, tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { acquireRunLock, slurmJobOf } from "../../src/batch/run-lock.js";

const folder = mkdtempSync(join(tmpdir(), "horologium-lock-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** The pid of a process that has already ended. */
function deadPid(): number {
  const child = spawnSync(process.execPath, ["-e", "process.stdout.write(String(process.pid))"], { encoding: "utf8" });
  return Number(child.stdout);
}

describe("the results lock", () => {
  it("keeps a second run out while the first holds it, and is gone after release", () => {
    const out = join(folder, "a.csv");
    const lock = acquireRunLock(out);
    expect(() => acquireRunLock(out)).toThrow(new RegExp(`a\\.csv\\.lock: process ${process.pid} on ${hostname()} is writing these results`));
    lock.release();
    expect(existsSync(`${out}.lock`)).toBe(false);
    acquireRunLock(out).release();
  });

  it("is taken over from a run that was killed on this host", () => {
    const out = join(folder, "b.csv");
    writeFileSync(`${out}.lock`, JSON.stringify({ pid: deadPid(), host: hostname(), slurmJob: null }));
    acquireRunLock(out).release();
  });

  it("is refused from another host, unless held by this same (requeued) Slurm job", () => {
    const out = join(folder, "c.csv");
    writeFileSync(`${out}.lock`, JSON.stringify({ pid: 12345, host: "other-node-17", slurmJob: "900_3" }));
    expect(() => acquireRunLock(out, { SLURM_ARRAY_JOB_ID: "900", SLURM_ARRAY_TASK_ID: "4" })).toThrow(/process 12345 on other-node-17/);
    acquireRunLock(out, { SLURM_ARRAY_JOB_ID: "900", SLURM_ARRAY_TASK_ID: "3" }).release();
    expect(slurmJobOf({ SLURM_JOB_ID: "77" })).toBe("77");
    expect(slurmJobOf({})).toBeUndefined();
  });
});
