/**
 * Fits per second so far and the time left at that rate: rate = recorded / elapsed, ETA = remaining /
 * rate. Both are undefined until something was recorded (or when the amount of work is unknown).
 */
export function throughput(
  recorded: number,
  toDo: number | undefined,
  elapsedMs: number,
): { rate: number | undefined; etaSeconds: number | undefined } {
  if (recorded <= 0 || elapsedMs <= 0) return { rate: undefined, etaSeconds: undefined };
  const rate = recorded / (elapsedMs / 1000);
  const etaSeconds = toDo === undefined ? undefined : Math.max(0, toDo - recorded) / rate;
  return { rate, etaSeconds };
}

/**
 * A duration for people: `42s`, `3m 05s`, `2h 07m`, `3d 04h`.
 *
 * @example formatDuration(185) // "3m 05s"
 */
export function formatDuration(seconds: number | undefined): string {
  if (seconds === undefined || !Number.isFinite(seconds)) return "?";
  const s = Math.round(seconds);
  const pad = (n: number) => String(n).padStart(2, "0");
  if (s < 60) return `${s}s`;
  if (s < 3600) return `${Math.floor(s / 60)}m ${pad(s % 60)}s`;
  if (s < 86400) return `${Math.floor(s / 3600)}h ${pad(Math.floor((s % 3600) / 60))}m`;
  return `${Math.floor(s / 86400)}d ${pad(Math.floor((s % 86400) / 3600))}h`;
}

/** A rate of fits for people, with two significant digits below 10: `0.42 fits/s`, `3.1 fits/s`, `57 fits/s`. */
export function formatRate(rate: number | undefined): string {
  if (rate === undefined) return "? fits/s";
  return `${rate < 10 ? rate.toPrecision(2) : Math.round(rate)} fits/s`;
}
