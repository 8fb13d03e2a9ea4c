import type { FitResult } from "./fit-result.js";

/** The thinned posterior draws stored in a fit result (`posteriorSample`), for predictions and reports. */
export interface StoredPosteriorSample {
  /** Parameter names, in the order of each row. */
  readonly names: readonly string[];
  /** Chain (or walker) of each row. */
  readonly chain: readonly number[];
  /** Physical parameter vectors. */
  readonly rows: readonly (readonly number[])[];
}

/** The stored draws of a result, checked for shape; throws a RangeError naming what is wrong. */
export function storedPosteriorSample(result: FitResult, expectedNames: readonly string[]): StoredPosteriorSample {
  const sample = result.posteriorSample as StoredPosteriorSample | undefined;
  if (!sample || !Array.isArray(sample.rows) || !Array.isArray(sample.names) || sample.rows.length === 0)
    throw new RangeError("the result has no posteriorSample (posterior draws); refit with this version of horologium");
  if (sample.names.join(",") !== expectedNames.join(","))
    throw new RangeError(`the result's posteriorSample has parameters ${sample.names.join(", ")}, the model needs ${expectedNames.join(", ")}`);
  for (const [k, row] of sample.rows.entries())
    if (!Array.isArray(row) || row.length !== sample.names.length || !row.every(Number.isFinite))
      throw new RangeError(`posteriorSample row ${k} is not ${sample.names.length} finite numbers`);
  return sample;
}

/** At most `count` items spread evenly over a list (every chain of a chain-ordered sample gets its share). */
export function evenlySpacedItems<T>(items: readonly T[], count: number): T[] {
  const n = Math.min(items.length, count);
  return Array.from({ length: n }, (_, k) => items[Math.floor((k * items.length) / n)]);
}
