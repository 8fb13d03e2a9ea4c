/**
 * A round offset to subtract from times before plotting, so axis labels stay short: Julian dates near
 * 2.46e6 would otherwise print seven digits per tick. Zero when the times are already small.
 *
 * @example timeOffset([2459123.4, 2459876.1]) // 2459000
 */
export function timeOffset(times: ArrayLike<number>): number {
  if (times.length === 0) return 0;
  let first = Infinity;
  for (let i = 0; i < times.length; i++) if (times[i]! < first) first = times[i]!;
  // Below 1e4 labels are at most four digits before the point; nothing to gain.
  if (!(Math.abs(first) >= 1e4)) return 0;
  return Math.sign(first) * Math.floor(Math.abs(first) / 1000) * 1000;
}

/** The time-axis title: "Time [d]" or, with an offset, "Time − 59000 [d]". */
export function timeAxisTitle(offset: number, timeUnit: string): string {
  if (offset === 0) return `Time [${timeUnit}]`;
  return offset > 0 ? `Time − ${offset} [${timeUnit}]` : `Time + ${-offset} [${timeUnit}]`;
}
