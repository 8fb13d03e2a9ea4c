import type { Rng } from "../random/rng.js";

/**
 * Observation-time generators for simulated light curves: a ground-based survey with observing seasons
 * and weather, and a continuous space-like stare. Times are in days; every random choice comes from
 * the explicit generator passed in, so a seed fixes the cadence bit for bit.
 */

/** Days in a Julian year, the period of the seasonal visibility cycle. */
export const DAYS_PER_YEAR = 365.25;

/** Options of {@link seasonalGroundCadence}; all durations in days. */
export interface SeasonalCadenceOptions {
  /** Time of the first possible night, in days (for example an MJD). Default 0. */
  readonly start?: number;
  /** Number of observing seasons (one per year). Default 5. */
  readonly seasons?: number;
  /**
   * Length of each yearly visibility window. Default 182.6 d: a target near the ecliptic is lost
   * behind the Sun for about six months each year (common practice).
   */
  readonly seasonLength?: number;
  /** Mean spacing between visited nights within a season, before weather losses. Default 3 d. */
  readonly revisitInterval?: number;
  /** Fraction of planned nights lost to weather, in [0, 1). Default 0.3 (common practice for a good site). */
  readonly weatherLoss?: number;
  /**
   * Half-width of the uniform scatter of the observing time around local midnight (< 0.5 d).
   * Default 0.125 d (+-3 h), so that the one-day alias is smeared as it is in real data.
   */
  readonly nightlyJitter?: number;
  /** Visits per observed night, spaced by `visitSpacing`. Default 1. */
  readonly visitsPerNight?: number;
  /** Spacing between visits within a night. Default 0.02 d (about 30 min). */
  readonly visitSpacing?: number;
}

/**
 * A seasonal ground-based cadence: each year a visibility window of `seasonLength` days, nights every
 * `revisitInterval` days (rounded to whole nights so that observations stay near midnight), each lost
 * to weather with probability `weatherLoss`, observed at midnight plus a uniform jitter.
 *
 * @returns sorted observation times in days
 * @example seasonalGroundCadence({ start: 58000, seasons: 3 }, createRng(1))
 */
export function seasonalGroundCadence(options: SeasonalCadenceOptions, rng: Rng): Float64Array {
  const start = options.start ?? 0;
  const seasons = options.seasons ?? 5;
  const seasonLength = options.seasonLength ?? 182.6;
  const revisit = options.revisitInterval ?? 3;
  const weatherLoss = options.weatherLoss ?? 0.3;
  const jitter = options.nightlyJitter ?? 0.125;
  const visits = options.visitsPerNight ?? 1;
  const visitSpacing = options.visitSpacing ?? 0.02;
  requireFinite("start", start);
  if (!(Number.isInteger(seasons) && seasons >= 1)) throw new RangeError(`seasons must be a positive integer, got ${seasons}`);
  if (!(seasonLength > 0 && seasonLength <= DAYS_PER_YEAR)) {
    throw new RangeError(`seasonLength must lie in (0, ${DAYS_PER_YEAR}] days, got ${seasonLength}`);
  }
  if (!(revisit >= 1)) throw new RangeError(`revisitInterval must be at least 1 day, got ${revisit}`);
  if (!(weatherLoss >= 0 && weatherLoss < 1)) throw new RangeError(`weatherLoss must lie in [0, 1), got ${weatherLoss}`);
  if (!(jitter >= 0 && jitter < 0.5)) throw new RangeError(`nightlyJitter must lie in [0, 0.5) days, got ${jitter}`);
  if (!(Number.isInteger(visits) && visits >= 1)) throw new RangeError(`visitsPerNight must be a positive integer, got ${visits}`);
  if (!(visitSpacing >= 0 && (visits - 1) * visitSpacing < 0.5 - jitter)) {
    throw new RangeError(`visitSpacing ${visitSpacing} d does not fit ${visits} visits into one night`);
  }
  const times: number[] = [];
  for (let season = 0; season < seasons; season++) {
    // Whole nights from the first night of the campaign, so every visit sits near local midnight.
    const firstNight = Math.round(season * DAYS_PER_YEAR);
    let lastNight = Number.NEGATIVE_INFINITY;
    for (let k = 0; k * revisit < seasonLength; k++) {
      const night = firstNight + Math.round(k * revisit);
      if (night === lastNight) continue;
      lastNight = night;
      if (rng.uniform() < weatherLoss) continue;
      const midnight = start + night + jitter * (2 * rng.uniform() - 1);
      for (let v = 0; v < visits; v++) times.push(midnight + v * visitSpacing);
    }
  }
  return Float64Array.from(times).sort();
}

/** Options of {@link continuousSpaceCadence}; all durations in days. */
export interface ContinuousCadenceOptions {
  /** Time of the first exposure, in days. Default 0. */
  readonly start?: number;
  /** Total span of the stare. Default 27 d (common practice for one pointing of a wide-field space survey). */
  readonly duration?: number;
  /** Exposure spacing. Default 1/48 d (30 min). */
  readonly interval?: number;
  /** Spacing of periodic data-downlink gaps; omit for none. */
  readonly gapEvery?: number;
  /** Length of each downlink gap. Default 1 d when `gapEvery` is given. */
  readonly gapLength?: number;
  /** Fraction of exposures lost at random (flagged frames), in [0, 1). Default 0.02 (common practice). */
  readonly lossFraction?: number;
}

/**
 * A continuous space-like cadence: exposures every `interval` days over `duration`, less optional
 * periodic downlink gaps and a random fraction of flagged exposures.
 *
 * @returns sorted observation times in days
 * @example continuousSpaceCadence({ duration: 27 }, createRng(7)) // ~1270 times, 30 min apart
 */
export function continuousSpaceCadence(options: ContinuousCadenceOptions, rng: Rng): Float64Array {
  const start = options.start ?? 0;
  const duration = options.duration ?? 27;
  const interval = options.interval ?? 1 / 48;
  const lossFraction = options.lossFraction ?? 0.02;
  const gapEvery = options.gapEvery;
  const gapLength = options.gapLength ?? (gapEvery !== undefined ? 1 : 0);
  requireFinite("start", start);
  if (!(duration > 0 && Number.isFinite(duration))) throw new RangeError(`duration must be positive, got ${duration}`);
  if (!(interval > 0 && interval <= duration)) throw new RangeError(`interval must lie in (0, duration], got ${interval}`);
  if (!(lossFraction >= 0 && lossFraction < 1)) throw new RangeError(`lossFraction must lie in [0, 1), got ${lossFraction}`);
  if (gapEvery !== undefined && !(gapEvery > 0)) throw new RangeError(`gapEvery must be positive, got ${gapEvery}`);
  if (!(gapLength >= 0) || (gapEvery !== undefined && gapLength >= gapEvery)) {
    throw new RangeError(`gapLength must lie in [0, gapEvery), got ${gapLength}`);
  }
  const count = Math.floor(duration / interval + 1e-9) + 1;
  const times: number[] = [];
  for (let i = 0; i < count; i++) {
    const offset = i * interval;
    // Each downlink gap closes a segment of length gapEvery - gapLength.
    if (gapEvery !== undefined && offset % gapEvery >= gapEvery - gapLength) continue;
    if (rng.uniform() < lossFraction) continue;
    times.push(start + offset);
  }
  return Float64Array.from(times);
}

function requireFinite(name: string, value: number): void {
  if (!Number.isFinite(value)) throw new RangeError(`${name} must be finite, got ${value}`);
}
