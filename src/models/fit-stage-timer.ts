/** Wall time of the named stages of a fit, in seconds, in the order they ran. */
export type StageSeconds = Readonly<Record<string, number>>;

/**
 * A stopwatch for the stages of a fit: `lap(name)` adds the time since the previous lap (or the start)
 * to that stage. The clock is passed in (milliseconds), so tests and reproducible runs can fix it.
 */
export function stageTimer(clock: () => number): { readonly seconds: StageSeconds; lap(name: string): void } {
  const seconds: Record<string, number> = {};
  let last = clock();
  return {
    seconds,
    lap(name) {
      const now = clock();
      seconds[name] = (seconds[name] ?? 0) + (now - last) / 1000;
      last = now;
    },
  };
}
