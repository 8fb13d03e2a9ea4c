import { sortedQuantile } from "../numerics/order-statistics.js";

/** The central fraction of the values an axis must show; the rest may lie beyond its edges. */
const BULK_MASS = 0.99;
/** Margin added on each side, as a fraction of the bulk's span. */
const MARGIN = 0.08;

/**
 * The range of an axis that shows the bulk of the values: from the 0.5% to the 99.5% quantile, widened
 * by 8% of that span on each side and then to hold every value of `alsoShow` (for example a model curve),
 * so a handful of outliers cannot squash the picture (common practice). Values beyond it are drawn at
 * the edge with a marker. A constant sample gets a range of +-1% (or +-0.5 at zero) around its value.
 */
export function bulkRange(values: ArrayLike<number>, alsoShow: ArrayLike<number> = []): [number, number] {
  const finite = Float64Array.from(Array.prototype.filter.call(values, Number.isFinite) as number[]).sort();
  if (finite.length === 0) return [0, 1];
  const tail = (1 - BULK_MASS) / 2;
  let low = sortedQuantile(finite, tail);
  let high = sortedQuantile(finite, 1 - tail);
  const span = high - low;
  low -= MARGIN * span;
  high += MARGIN * span;
  for (let i = 0; i < alsoShow.length; i++) {
    const v = alsoShow[i];
    if (Number.isFinite(v)) (low = Math.min(low, v)), (high = Math.max(high, v));
  }
  if (!(high > low)) {
    const half = low === 0 ? 0.5 : Math.abs(low) * 0.01;
    return [low - half, high + half];
  }
  return [low, high];
}
