import type { ImportanceSample } from "../../../src/inference/importance-sampling.js";

/** The weighted p-quantile of coordinate i of an importance sample: the smallest draw whose cumulative weight reaches p. */
export function weightedQuantile(sample: ImportanceSample, i: number, p: number): number {
  const order = sample.points.map((_, s) => s).sort((a, b) => sample.points[a][i] - sample.points[b][i]);
  let cumulative = 0;
  for (const s of order) {
    cumulative += sample.weights[s];
    if (cumulative >= p) return sample.points[s][i];
  }
  return sample.points[order[order.length - 1]][i];
}
