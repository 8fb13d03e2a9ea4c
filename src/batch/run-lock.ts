import { closeSync, openSync, readFileSync, unlinkSync, writeSync } from "node:fs";
import { hostname } from "node:os";
import { UsageError } from "../cli/cli-io.js";

/** A held lock; release it when the run ends. */
export interface RunLock {
  readonly path: string;
  release(): void;
}

/**
 * Takes the lock `<out>.lock`, so that two runs never append to the same results at once. The lock file
 * names the process and host holding it. A lock left behind by a run that was killed is taken over when
 * its process no longer exists on this host; a lock held from another host is refused with a message
 * saying which file to delete once that run is known to be over.
 */
export function acquireRunLock(outputPath: string): RunLock {
  const path = `${outputPath}.lock`;
  const host = hostname();
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      const fd = openSync(path, "wx");
      writeSync(fd, JSON.stringify({ pid: process.pid, host, since: new Date().toISOString() }) + "\n");
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
    if (holder && holder.host === host && !processExists(holder.pid)) {
      unlinkSync(path); // left by a run that was killed
      continue;
    }
    const who = holder ? `process ${holder.pid} on ${holder.host}` : "an unknown process";
    throw new UsageError(
      `${path}: ${who} is writing these results; wait for it, or delete the lock file if that run is over`,
    );
  }
  throw new UsageError(`${path}: cannot take the lock`);
}

function readHolder(path: string): { pid: number; host: string } | undefined {
  try {
    const parsed = JSON.parse(readFileSync(path, "utf8")) as { pid?: unknown; host?: unknown };
    if (typeof parsed.pid === "number" && typeof parsed.host === "string") return { pid: parsed.pid, host: parsed.host };
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
