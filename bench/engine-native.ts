import { spawn, spawnSync, type ChildProcessWithoutNullStreams } from "node:child_process";
import { existsSync, mkdirSync, unlinkSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { createInterface, type Interface } from "node:readline";
import { fileURLToPath } from "node:url";
import type { EngineData } from "./engine-cases.js";
import type { Batch } from "./engine-timing.js";

/**
 * The repository root: the nearest folder above this file that holds package.json (this file runs both
 * from bench/ under tsx and from dist/bench/ after `npm run build`).
 */
export function repositoryRoot(): string {
  let folder = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    if (existsSync(join(folder, "package.json"))) return folder;
    const parent = dirname(folder);
    if (parent === folder) throw new Error("engine benchmark: cannot find the repository root (package.json)");
    folder = parent;
  }
}

/** The C compiler's flags for the reference program. */
export const NATIVE_FLAGS = ["-O3", "-march=native"] as const;

/**
 * Compiles bench/c/engine-loglike.c with gcc -O3 -march=native into bench/build/engine-loglike and returns
 * the executable's path. Throws with the compiler's message when gcc fails or is missing.
 */
export function buildNativeEngine(root: string): string {
  const source = join(root, "bench", "c", "engine-loglike.c");
  const folder = join(root, "bench", "build");
  mkdirSync(folder, { recursive: true });
  const executable = join(folder, "engine-loglike");
  const result = spawnSync("gcc", [...NATIVE_FLAGS, "-Wall", "-o", executable, source, "-lm"], { encoding: "utf8" });
  if (result.error) throw new Error(`engine benchmark: cannot run gcc (${result.error.message})`);
  if (result.status !== 0) throw new Error(`engine benchmark: gcc failed:\n${result.stderr}`);
  return executable;
}

/** The first line of `gcc --version`. */
export function compilerVersion(): string {
  const result = spawnSync("gcc", ["--version"], { encoding: "utf8" });
  return result.status === 0 ? result.stdout.split("\n")[0].trim() : "gcc: unavailable";
}

/**
 * Writes a light curve in the C program's input format (little-endian): magic "HORODAT1", uint64 n,
 * float64 mean, then the n times, n errors and n values as float64.
 */
export function writeDataFile(path: string, data: EngineData): void {
  const n = data.time.length;
  const bytes = Buffer.alloc(24 + 24 * n);
  bytes.write("HORODAT1", 0, "latin1");
  bytes.writeBigUInt64LE(BigInt(n), 8);
  bytes.writeDoubleLE(data.mean, 16);
  let offset = 24;
  for (const column of [data.time, data.errors, data.value]) {
    for (let i = 0; i < n; i++) {
      bytes.writeDoubleLE(column[i], offset);
      offset += 8;
    }
  }
  writeFileSync(path, bytes);
}

/**
 * Runs `measure` with the C reference program serving `data` for the kernel `terms` (the data written to
 * `dataFile` first); the program is closed and the file removed afterwards, whatever happens.
 */
export async function withNativeEngine<T>(
  executable: string,
  dataFile: string,
  data: EngineData,
  terms: readonly string[],
  measure: (native: NativeEngine) => Promise<T>,
): Promise<T> {
  writeDataFile(dataFile, data);
  const native = NativeEngine.start(executable, dataFile, terms);
  try {
    return await measure(native);
  } finally {
    await native.close();
    unlinkSync(dataFile);
  }
}

/**
 * A running C reference program in serve mode, loaded with one light curve and one kernel. Each request
 * runs a batch of evaluations in the C process while the Node process waits, so C and TypeScript batches
 * can be interleaved one by one.
 */
export class NativeEngine {
  private readonly pending: Array<(line: string) => void> = [];
  private readonly lines: Interface;
  private stderr = "";

  private constructor(private readonly child: ChildProcessWithoutNullStreams) {
    this.lines = createInterface({ input: child.stdout });
    this.lines.on("line", (line) => this.pending.shift()?.(line));
    child.stderr.on("data", (chunk: Buffer) => {
      this.stderr += chunk.toString();
    });
  }

  /** Starts the program on a data file written by `writeDataFile`, for the given kernel terms. */
  static start(executable: string, dataFile: string, terms: readonly string[]): NativeEngine {
    return new NativeEngine(spawn(executable, ["--serve", dataFile, ...terms]));
  }

  /**
   * Runs `repeat` evaluations: "full" = build + check + evaluate, "core" = the recursion alone, "gradient" =
   * log-likelihood and gradient on the prepared inputs (the gradient comes back in `gradient`).
   */
  run(mode: "full" | "core" | "gradient", repeat: number): Promise<Batch & { readonly gradient: readonly number[] }> {
    return new Promise((resolve, reject) => {
      const onExit = (code: number | null) =>
        reject(new Error(`engine benchmark: C program exited (${code}) ${this.stderr.trim()}`));
      this.child.once("exit", onExit);
      this.pending.push((line) => {
        this.child.off("exit", onExit);
        const [value, seconds, cpuSeconds, ...gradient] = line.trim().split(/\s+/).map(Number);
        if (!Number.isFinite(seconds) || !Number.isFinite(cpuSeconds))
          reject(new Error(`engine benchmark: bad answer from C program: ${line}`));
        else resolve({ value, seconds, cpuSeconds, gradient });
      });
      this.child.stdin.write(`${mode} ${repeat}\n`);
    });
  }

  /**
   * How many evaluations of `mode` make one batch of about `targetSeconds` (as `calibrateRepeat` for the
   * TypeScript side): one warm-up request, one timed request, the count rounded up, at least 1.
   */
  async calibrateRepeat(mode: "full" | "core" | "gradient", targetSeconds: number): Promise<number> {
    await this.run(mode, 1);
    const once = await this.run(mode, 1);
    return Math.max(1, Math.ceil(targetSeconds / Math.max(once.seconds, 1e-9)));
  }

  /** Ends the program (closing its input ends its loop) and waits for it to exit. */
  close(): Promise<void> {
    return new Promise((resolve) => {
      if (this.child.exitCode !== null) {
        resolve();
        return;
      }
      this.child.once("exit", () => resolve());
      this.child.stdin.end();
    });
  }
}
