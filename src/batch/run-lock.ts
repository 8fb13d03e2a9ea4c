import { closeSync, openSync, readFileSync, unlinkSync, writeSync } from "node:fs";
import { hostname } from "node:os";
import { UsageError } from "../errors/usage-error.js";

/** A held lock; release it when the run ends. */
export interface RunLock {
  readonly path: string;
  release(): void;
}

/**
 * The Slurm job (array job and task, or job id) this process belongs to, from the variables Slurm sets;
 * undefined outside Slurm. A requeued job keeps its id, and Slurm never runs two copies of one job.
 */
export function slurmJobOf(env: Readonly<Record<string, string | undefined>>): string | undefined {
  if (env.SLURM_ARRAY_JOB_ID && env.SLURM_ARRAY_TASK_ID) return `${env.SLURM_ARRAY_JOB_ID}_${env.SLURM_ARRAY_TASK_ID}`;
  return env.SLURM_JOB_ID || undefined;
}

/**
 * Takes the lock `<out>.lock`, so that two runs never append to the same results at once. The lock file
 * names the process, host and Slurm job holding it. A lock left behind by a run that was killed is taken
 * over when its process no longer exists on this host, or when it was held by this same Slurm job (a
 * task requeued after preemption or a node failure, possibly onto another node). Any other lock is
 * refused with a message saying which file to delete once that run is known to be over.
 */
export function acquireRunLock(outputPath: string, env: Readonly<Record<string, string | undefined>> = {}): RunLock {
  const path = `${outputPath}.lock`;
  const host = hostname();
  const slurmJob = slurmJobOf(env);
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      const fd = openSync(path, "wx");
      writeSync(fd, JSON.stringify({ pid: process.pid, host, slurmJob: slurmJob ?? null }) + "\n");
      closeSync(fd);
      return {
        path,
        release: () => {
          try {
            unlinkSync(path);
          } catch {
            // already gone
          }
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    }
    const holder = readHolder(path);
    const killedHere = holder !== undefined && holder.host === host && !processExists(holder.pid);
    const sameSlurmJob = holder !== undefined && slurmJob !== undefined && holder.slurmJob === slurmJob;
    if (killedHere || sameSlurmJob) {
      unlinkSync(path); // left by a run that was killed, or by an earlier run of this requeued job
      continue;
    }
    const who = holder ? `process ${holder.pid} on ${holder.host}` : "an unknown process";
    throw new UsageError(
      `${path}: ${who} is writing these results; wait for it, or delete the lock file if that run is over`,
    );
  }
  throw new UsageError(`${path}: cannot take the lock`);
}

function readHolder(path: string): { pid: number; host: string; slurmJob?: string } | undefined {
  try {
    const parsed = JSON.parse(readFileSync(path, "utf8")) as { pid?: unknown; host?: unknown; slurmJob?: unknown };
    if (typeof parsed.pid === "number" && typeof parsed.host === "string") {
      return { pid: parsed.pid, host: parsed.host, slurmJob: typeof parsed.slurmJob === "string" ? parsed.slurmJob : undefined };
    }
  } catch {
    // an empty or torn lock file: its writer died while creating it
  }
  return undefined;
}

function processExists(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}
