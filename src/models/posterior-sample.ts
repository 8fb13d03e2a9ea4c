import type { FitResult, StoredPosteriorSample } from "./fit-result.js";

/**
 * The stored draws of a result, checked against the model that will use them (the shape was checked when the
 * file was read, by parseFitResult): throws a RangeError naming what does not fit.
 */
export function storedPosteriorSample(result: FitResult, expectedNames: readonly string[]): StoredPosteriorSample {
  const sample = result.posteriorSample;
  if (sample.rows.length === 0) throw new RangeError("the result's posteriorSample holds no draws (the run stopped before sampling)");
  if (sample.names.join(",") !== expectedNames.join(","))
    throw new RangeError(`the result's posteriorSample has parameters ${sample.names.join(", ")}, the model needs ${expectedNames.join(", ")}`);
  for (const [k, row] of sample.rows.entries())
    if (!row.every(Number.isFinite)) throw new RangeError(`posteriorSample row ${k} holds a value that is not a finite number`);
  return sample;
}
