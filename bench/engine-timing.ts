import { performance } from "node:perf_hooks";

/** The median of a list of numbers (mean of the two middle values for an even count). */
export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

/** One timed batch: wall-clock and process CPU seconds of `repeat` calls, and the last value returned. */
export interface Batch {
  readonly seconds: number;
  /** CPU seconds of this process (user + system, all its threads): time spent waiting for a core is excluded. */
  readonly cpuSeconds: number;
  readonly value: number;
}

/** Times `repeat` back-to-back calls of `work` (which returns a number, so the call cannot be dropped). */
export function timeBatch(work: () => number, repeat: number): Batch {
  let value = 0;
  const cpuStart = process.cpuUsage();
  const start = performance.now();
  for (let i = 0; i < repeat; i++) value = work();
  const seconds = (performance.now() - start) / 1000;
  const cpu = process.cpuUsage(cpuStart);
  return { seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6, value };
}

/**
 * How many calls of `work` make one batch of about `targetSeconds`: one call is timed (after the caller's
 * warm-up) and the count rounded up, at least 1. Short batches are dominated by timer resolution and
 * scheduler noise; long ones waste the benchmark's time budget.
 */
export function calibrateRepeat(work: () => number, targetSeconds: number): number {
  const once = timeBatch(work, 1).seconds;
  const probe = once < targetSeconds / 20 ? timeBatch(work, 10).seconds / 10 : once;
  return Math.max(1, Math.ceil(targetSeconds / Math.max(probe, 1e-9)));
}

/**
 * Runs every step once per round for `rounds` rounds, the order rotated by one from round to round, so that
 * a burst of load from other processes hits every measurement alike (ratios are then taken within a round).
 */
export async function runRotatingRounds(steps: ReadonlyArray<() => Promise<void>>, rounds: number): Promise<void> {
  for (let round = 0; round < rounds; round++) {
    for (let s = 0; s < steps.length; s++) await steps[(round + s) % steps.length]();
  }
}

/** Which clock a figure is read from. */
export type Clock = "cpu" | "wall";

/** Nanoseconds per point of a batch of `repeat` evaluations over `points` points, on the chosen clock. */
export function nanosecondsPerPoint(batch: Batch, repeat: number, points: number, clock: Clock): number {
  return (1e9 * (clock === "cpu" ? batch.cpuSeconds : batch.seconds)) / (repeat * points);
}

/** Formats a number with a fixed count of significant digits for the Markdown tables. */
export function formatSignificant(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const decimals = Math.max(0, digits - 1 - magnitude);
  return value.toFixed(decimals);
}

/** A Markdown table from a header row and body rows. */
export function markdownTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]) => `| ${cells.join(" | ")} |`;
  return [line(header), line(header.map(() => "---")), ...rows.map(line)].join("\n");
}
