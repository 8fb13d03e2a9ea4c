import type { ChainTrace, ImportanceSample, MethodPosterior } from "../inference/index.js";
import { evenlySpacedIndices } from "../numerics/even-thinning.js";
import type { FitResult, StoredChainTrace, StoredImportanceWeights } from "./fit-result.js";

/** Significant digits of the stored trace values: far finer than a trace panel's pixel. */
const TRACE_DIGITS = 6;
/** The largest importance weights, all stored. */
const LARGEST_WEIGHTS_KEPT = 50;
/** Importance weights stored in all at most (the rest thinned evenly by rank). */
const MAX_STORED_WEIGHTS = 300;

/** A number rounded to {@link TRACE_DIGITS} significant digits (non-finite values as they are: JSON writes them null). */
function rounded(value: number): number {
  return Number.isFinite(value) ? Number(value.toPrecision(TRACE_DIGITS)) : value;
}

/** A trace of the inference layer as the result stores it (plain arrays, rounded values). */
export function storedChainTrace(trace: ChainTrace): StoredChainTrace {
  return {
    ...trace,
    series: trace.series.map((s) => ({
      ...s,
      values: Object.fromEntries(trace.names.map((name) => [name, (s.values[name] ?? []).map(rounded)])),
      logPosterior: s.logPosterior.map(rounded),
    })),
  };
}

/** The weights of an importance sample as the result stores them ({@link StoredImportanceWeights}). */
export function storedImportanceWeights(sample: ImportanceSample): StoredImportanceWeights {
  const n = sample.weights.length;
  const sorted = Float64Array.from(sample.weights).sort().reverse();
  const head = Math.min(n, LARGEST_WEIGHTS_KEPT);
  const tail = evenlySpacedIndices(n - head, MAX_STORED_WEIGHTS - head).map((i) => head + i);
  const last = n - 1;
  const picks = [...Array.from({ length: head }, (_, i) => i), ...tail];
  if (n > head && picks[picks.length - 1] !== last) picks.push(last);
  return {
    draws: n,
    paretoK: sample.paretoShape,
    paretoKThreshold: sample.shapeThreshold,
    effectiveSampleSize: sample.effectiveSampleSize,
    ranks: picks.map((i) => i + 1),
    scaledWeights: picks.map((i) => rounded(sorted[i] * n)),
  };
}

/**
 * What the result keeps of how each run sampled: the bounded trace of each MCMC run
 * (`chainTraces`) and the weights of each run whose importance sample was used (`importanceWeights`).
 */
export function runRecords(runs: readonly MethodPosterior[]): Pick<FitResult, "chainTraces" | "importanceWeights"> {
  const traces = runs.flatMap((run) => (run.sample ? [storedChainTrace(run.sample.trace)] : []));
  const weights = runs.flatMap((run) => (run.method === "importance" && run.importance ? [storedImportanceWeights(run.importance)] : []));
  return {
    ...(traces.length > 0 ? { chainTraces: traces } : {}),
    ...(weights.length > 0 ? { importanceWeights: weights } : {}),
  };
}
