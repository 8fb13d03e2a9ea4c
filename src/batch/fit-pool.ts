import { Worker } from "node:worker_threads";
import { InputError } from "../errors/input-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { FitRequest, FitWorkerData, FitWorkerMessage } from "./fit-worker-protocol.js";
import type { ResultRow } from "./result-row.js";
import { compiledWorkerUrl } from "./compiled-location.js";

/** Options of {@link FitPool.start}. */
export interface FitPoolOptions {
  /** Number of worker threads (one fit at a time each). */
  readonly workers: number;
  /** URL of the module exporting `fitLightCurve`; undefined for the project's own fit. */
  readonly fitModule?: string;
  /** Seconds one fit may take before its worker is stopped and the object recorded as failed; 0 = no limit. */
  readonly timeoutSeconds?: number;
  /** Heap limit of each worker in MiB: a fit that needs more fails alone instead of taking the process down. */
  readonly memoryLimitMb?: number;
  /** The compiled worker script; defaults to {@link compiledWorkerUrl}. */
  readonly workerScript?: URL;
}

/** How one object's fit ended. */
export type FitOutcome = { readonly kind: "ok"; readonly row: ResultRow } | { readonly kind: "failed"; readonly reason: string };

interface Job {
  readonly request: FitRequest;
  readonly resolve: (outcome: FitOutcome) => void;
  readonly reject: (error: Error) => void;
}

interface Slot {
  readonly worker: Worker;
  ready: boolean;
  job?: Job;
  timer?: NodeJS.Timeout;
  /** Why the pool stopped this worker, when it did (a time limit). */
  stopReason?: string;
  /** The last uncaught error of the thread. */
  crash?: string;
}

/**
 * A pool of worker threads that fit light curves. Each worker loads the fit module once and fits one
 * object at a time. Whatever happens to one object (the fit throws, the thread crashes or runs out of
 * memory, the time limit passes) ends as a "failed" outcome with the reason, and a crashed worker is
 * replaced; only a fit module that cannot be loaded at all is fatal.
 */
export class FitPool {
  private readonly slots = new Set<Slot>();
  private readonly queue: Job[] = [];
  private readonly script: URL;
  private closed = false;
  private fatal?: Error;
  /** Workers that stopped while idle since the last completed fit: a sign the fit module itself is broken. */
  private idleCrashes = 0;

  private constructor(private readonly options: FitPoolOptions) {
    this.script = options.workerScript ?? compiledWorkerUrl();
  }

  /** Starts the workers and waits until each has loaded the fit module. */
  static async start(options: FitPoolOptions): Promise<FitPool> {
    if (!Number.isInteger(options.workers) || options.workers < 1) {
      throw new RangeError(`workers must be a positive integer, got ${options.workers}`);
    }
    const pool = new FitPool(options);
    try {
      await Promise.all(Array.from({ length: options.workers }, () => pool.spawn()));
    } catch (error) {
      await pool.close();
      throw error;
    }
    return pool;
  }

  /** The number of worker threads. */
  get size(): number {
    return this.options.workers;
  }

  /**
   * Fits one object on the next free worker. Resolves with the outcome (a failure of the object is an
   * outcome, not a rejection); rejects only when the pool itself can no longer work.
   */
  fit(objectId: string, lightCurves: readonly LightCurve[], options: FitRequest["options"]): Promise<FitOutcome> {
    if (this.closed) return Promise.reject(new Error("the fit pool is closed"));
    if (this.fatal) return Promise.reject(this.fatal);
    return new Promise<FitOutcome>((resolve, reject) => {
      this.queue.push({ request: { kind: "fit", objectId, lightCurves, options }, resolve, reject });
      this.dispatch();
    });
  }

  /** Stops every worker; fits still running are abandoned. */
  async close(): Promise<void> {
    this.closed = true;
    const stopping = [...this.slots].map((slot) => slot.worker.terminate());
    this.slots.clear();
    await Promise.allSettled(stopping);
  }

  private spawn(): Promise<void> {
    const data: FitWorkerData = { fitModule: this.options.fitModule };
    const worker = new Worker(this.script, {
      workerData: data,
      resourceLimits: this.options.memoryLimitMb ? { maxOldGenerationSizeMb: this.options.memoryLimitMb } : undefined,
      stdout: false,
      stderr: false,
    });
    const slot: Slot = { worker, ready: false };
    this.slots.add(slot);
    return new Promise<void>((resolveReady, rejectReady) => {
      worker.on("message", (message: FitWorkerMessage) => {
        switch (message.kind) {
          case "ready":
            slot.ready = true;
            resolveReady();
            this.dispatch();
            break;
          case "load-failed":
            rejectReady(new InputError(message.reason));
            void worker.terminate();
            break;
          case "fitted":
            this.finish(slot, { kind: "ok", row: message.row });
            break;
          case "fit-failed":
            this.finish(slot, { kind: "failed", reason: message.reason });
            break;
        }
      });
      worker.on("error", (error) => {
        slot.crash = error.message;
      });
      worker.on("exit", (code) => {
        this.slots.delete(slot);
        if (slot.timer) clearTimeout(slot.timer);
        if (!slot.ready) {
          rejectReady(new Error(`a batch worker stopped while starting (${slot.crash ?? `exit code ${code}`})`));
          return;
        }
        const job = slot.job;
        slot.job = undefined;
        if (job && this.closed) {
          job.reject(new Error("the fit pool was closed before the fit ended"));
        } else if (job) {
          const reason = slot.stopReason ?? `the worker thread stopped during the fit (${slot.crash ?? `exit code ${code}`})`;
          job.resolve({ kind: "failed", reason });
        } else if (!this.closed && ++this.idleCrashes > 2 * this.options.workers + 2) {
          this.fail(new Error(`batch workers keep stopping while idle (${slot.crash ?? `exit code ${code}`})`));
          return;
        }
        if (!this.closed && !this.fatal) {
          this.spawn().catch((error: Error) => this.fail(error));
        }
      });
    });
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (this.queue.length === 0) return;
      if (!slot.ready || slot.job) continue;
      const job = this.queue.shift()!;
      slot.job = job;
      const limit = this.options.timeoutSeconds ?? 0;
      if (limit > 0) {
        slot.timer = setTimeout(() => {
          slot.stopReason = `no result within the time limit of ${limit} s`;
          void slot.worker.terminate();
        }, limit * 1000);
      }
      try {
        slot.worker.postMessage(job.request);
      } catch (error) {
        this.finish(slot, { kind: "failed", reason: `cannot send the light curve to a worker: ${(error as Error).message}` });
      }
    }
  }

  private finish(slot: Slot, outcome: FitOutcome): void {
    const job = slot.job;
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = undefined;
    slot.job = undefined;
    this.idleCrashes = 0;
    job?.resolve(outcome);
    this.dispatch();
  }

  private fail(error: Error): void {
    this.fatal = error;
    for (const job of this.queue.splice(0)) job.reject(error);
    for (const slot of this.slots) {
      slot.job?.reject(error);
      slot.job = undefined;
    }
  }
}
