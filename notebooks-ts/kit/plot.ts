/**
 * Small helpers the notebooks share for their Vega-Lite figures: the project's figure style, a few extra
 * colours, and joint draws of a process at data and grid times. The specifications themselves stay in the
 * notebooks, where the reader can see what each figure encodes.
 */
import type { TopLevelSpec } from "vega-lite";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import type { Kernel } from "../../src/kernels/index.js";
import type { Rng } from "../../src/random/rng.js";
import { FIGURE_COLORS, figureConfig } from "../../src/report/figure-style.js";

/** The report's colours plus those the notebooks add (the invented truth, held-out data, a second sample). */
export const COLORS = {
  ...FIGURE_COLORS,
  truth: "#d95f02",
  heldOut: "#7b3294",
  second: "#1b9e77",
  muted: "#9a9a9a",
} as const;

/** A top-level Vega-Lite specification with the project's figure style (font, sizes, frame). */
export function plotSpec(spec: Record<string, unknown>): TopLevelSpec {
  return { $schema: "https://vega.github.io/schema/vega-lite/v6.json", config: figureConfig(), ...spec } as unknown as TopLevelSpec;
}

/**
 * One noise-free draw of a zero-mean-plus-`mean` process, taken jointly at the observation times and at a
 * plotting grid (so the "true" curve drawn between observations is the same realisation the data sample).
 */
export function jointDraw(
  kernel: Kernel,
  mean: number,
  observed: Float64Array,
  grid: Float64Array,
  rng: Rng,
): { atObserved: Float64Array; atGrid: Float64Array } {
  const tagged = [...Array.from(observed, (t) => ({ t, grid: false })), ...Array.from(grid, (t) => ({ t, grid: true }))];
  tagged.sort((a, b) => a.t - b.t);
  const draw = new GaussianProcess(kernel, Float64Array.from(tagged, (p) => p.t), { mean }).priorDraw(rng);
  const atObserved: number[] = [];
  const atGrid: number[] = [];
  tagged.forEach((p, i) => (p.grid ? atGrid : atObserved).push(draw[i]));
  return { atObserved: Float64Array.from(atObserved), atGrid: Float64Array.from(atGrid) };
}

/** Evenly spaced times from `start` to `stop` inclusive. */
export function timeGrid(start: number, stop: number, count: number): Float64Array {
  return Float64Array.from({ length: count }, (_, i) => start + ((stop - start) * i) / (count - 1));
}

/** Quantile of unsorted values by linear interpolation between order statistics. */
export function quantile(values: ArrayLike<number>, q: number): number {
  const sorted = Float64Array.from(values).sort();
  const position = q * (sorted.length - 1);
  const lo = Math.floor(position);
  const hi = Math.ceil(position);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (position - lo);
}
