import type { ReportInput } from "./report-input.js";

/**
 * Checks that the arrays of a report input fit together, and throws a RangeError naming the first
 * mismatch: unequal lengths would otherwise draw silently wrong figures.
 */
export function checkReportInput(input: ReportInput): void {
  const { lightCurve, prediction, draws, periodogram, psdBand } = input;
  sameLength("lightCurve", { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) });
  sameLength("prediction", { time: prediction.time, mean: prediction.mean, sd: prediction.sd });
  if (periodogram) sameLength("periodogram", { frequency: periodogram.frequency, power: periodogram.power });
  if (psdBand) {
    sameLength("psdBand", { frequency: psdBand.frequency, median: psdBand.median, lower: psdBand.lower, upper: psdBand.upper });
  }
  if (draws.names.length === 0) throw new RangeError("draws.names is empty: the report needs posterior draws");
  let shape: { chains: number; steps: number } | undefined;
  for (const name of draws.names) {
    const chains = draws.chains[name];
    if (chains === undefined || chains.length === 0) throw new RangeError(`draws.chains has no chains for parameter "${name}"`);
    for (const [c, chain] of chains.entries()) {
      if (chain.length === 0) throw new RangeError(`draws.chains.${name}[${c}] is empty`);
      if (chain.length !== chains[0].length) {
        throw new RangeError(`draws.chains.${name}[${c}] has ${chain.length} draws, chain 0 has ${chains[0].length}`);
      }
    }
    if (shape === undefined) shape = { chains: chains.length, steps: chains[0].length };
    else if (shape.chains !== chains.length || shape.steps !== chains[0].length) {
      throw new RangeError(
        `draws.chains.${name} is ${chains.length} chains × ${chains[0].length} draws, ` +
          `but "${draws.names[0]}" is ${shape.chains} × ${shape.steps}`,
      );
    }
  }
}

function sameLength(what: string, columns: Record<string, ArrayLike<number>>): void {
  const entries = Object.entries(columns);
  const [firstName, first] = entries[0];
  for (const [name, column] of entries) {
    if (column.length !== first.length) {
      throw new RangeError(`${what}.${name} has ${column.length} values, ${what}.${firstName} has ${first.length}`);
    }
  }
}
