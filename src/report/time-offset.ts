/**
 * A round offset to subtract from times before plotting, so axis labels stay short: Julian dates near
 * 2.46e6 would otherwise print seven digits per tick. Zero when the times are already small.
 *
 * @example timeOffset([2459123.4, 2459876.1]) // 2459000
 */
export function timeOffset(times: ArrayLike<number>): number {
  if (times.length === 0) return 0;
  let first = Infinity;
  for (let i = 0; i < times.length; i++) if (times[i] < first) first = times[i];
  // Below 1e4 labels are at most four digits before the point; nothing to gain.
  if (!(Math.abs(first) >= 1e4)) return 0;
  return Math.sign(first) * Math.floor(Math.abs(first) / 1000) * 1000;
}

/** Time columns whose name says which time scale they hold, and how an axis names it. */
const TIME_SCALE_NAMES: Readonly<Record<string, string>> = {
  mjd: "MJD",
  jd: "JD",
  hjd: "HJD",
  bjd: "BJD",
  rjd: "RJD",
  btjd: "BTJD",
};

/**
 * What the times are, for an axis: "MJD" when the time column is named mjd (likewise JD, HJD, BJD,
 * common practice), else "Time".
 *
 * @example timeScaleName("MJD_obs") // "MJD"
 */
export function timeScaleName(timeColumn: string | undefined): string {
  const key = (timeColumn ?? "").trim().toLowerCase().replace(/[_\s-].*$/, "");
  return TIME_SCALE_NAMES[key] ?? "Time";
}

/** The time-axis title: "Time [d]" or, with an offset, "MJD − 59000 [d]" (the scale's name first). */
export function timeAxisTitle(offset: number, timeUnit: string, scaleName = "Time"): string {
  if (offset === 0) return `${scaleName} [${timeUnit}]`;
  return offset > 0 ? `${scaleName} − ${offset} [${timeUnit}]` : `${scaleName} + ${-offset} [${timeUnit}]`;
}
