import { InputError } from "../errors/input-error.js";
import { UsageError } from "../errors/usage-error.js";
import type { DataSummary } from "./data-summary.js";
import type { ModelName } from "./light-curve-model.js";

/** The periods a fit searches and allows, in the input time unit. */
export interface PeriodRange {
  readonly shortest: number;
  readonly longest: number;
}

/** Periods asked for by the user (`--min-period`, `--max-period`); either may be left to the defaults. */
export interface PeriodLimits {
  readonly minimumPeriod?: number;
  readonly maximumPeriod?: number;
}

/**
 * The period range of a periodic model, from the physics of the sampling unless the user set it:
 * - shortest: twice the typical separation of visits on different nights (`summary.visitSpacing`),
 *   the shortest period the visits resolve (a Nyquist argument, common practice), not twice the
 *   smallest spacing, which visits clustered minutes apart make absurdly short;
 * - longest: the baseline divided by `cyclesNeeded` (2 for rotation, which must see a repeat; 1 for
 *   the oscillator).
 * A range that is empty (a baseline shorter than the shortest period) is an InputError naming `source`;
 * limits that contradict each other are a UsageError.
 */
export function periodRange(summary: DataSummary, cyclesNeeded: number, limits: PeriodLimits, source: string): PeriodRange {
  const { minimumPeriod, maximumPeriod } = limits;
  if (minimumPeriod !== undefined && !(minimumPeriod > 0)) throw new UsageError(`--min-period must be > 0, got ${minimumPeriod}`);
  if (maximumPeriod !== undefined && !(maximumPeriod > 0)) throw new UsageError(`--max-period must be > 0, got ${maximumPeriod}`);
  if (minimumPeriod !== undefined && maximumPeriod !== undefined && !(maximumPeriod > minimumPeriod)) {
    throw new UsageError(`--max-period (${maximumPeriod}) must exceed --min-period (${minimumPeriod})`);
  }
  const shortest = minimumPeriod ?? Math.max(2 * summary.visitSpacing, summary.baseline * 1e-6);
  const longest = maximumPeriod ?? summary.baseline / cyclesNeeded;
  if (!(longest > shortest)) {
    const what = maximumPeriod !== undefined ? `--max-period (${maximumPeriod})` : `the baseline / ${cyclesNeeded} (${+longest.toPrecision(4)})`;
    const from = minimumPeriod !== undefined ? "--min-period" : "the shortest period the cadence resolves (twice the typical spacing of visits)";
    throw new InputError(
      `${what} is not longer than ${from} (${+shortest.toPrecision(4)}): the data cannot support a period search; ` +
        "a longer light curve is needed (or set --min-period/--max-period)",
      { file: source },
    );
  }
  return { shortest, longest };
}

/**
 * The period range of a model (undefined for the aperiodic damped random walk): rotation needs two
 * cycles inside the baseline to see a repeat, the oscillator one. See {@link periodRange}.
 */
export function modelPeriodRange(model: ModelName, summary: DataSummary, limits: PeriodLimits, source: string): PeriodRange | undefined {
  if (model === "drw") return undefined;
  return periodRange(summary, model === "quasi-periodic" ? 2 : 1, limits, source);
}
