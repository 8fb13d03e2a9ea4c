import type { LightCurve } from "../lightcurve/light-curve.js";
import { grossOutliers } from "../models/outlier-screen.js";
import { bulkRange } from "./bulk-range.js";

/**
 * The value axis of a light-curve figure: the {@link bulkRange} of the points that are neither likely
 * outliers of the robust noise (`flagged`, the result's `robust.flagged`) nor gross outliers about a
 * running median (`grossOutliers`, the screen the fit warns with), widened to hold `alsoShow` (the model
 * curve). Excluding them first matters for short light curves: a bulk of 99% of 250 points still holds
 * the second of three outliers, which would then stretch the axis. The excluded points are drawn at the
 * axis edge when they fall beyond it.
 */
export function valueAxisRange(lightCurve: LightCurve, flagged: (index: number) => boolean, alsoShow: ArrayLike<number> = []): [number, number] {
  const n = lightCurve.value.length;
  const excluded = new Uint8Array(n);
  for (const i of grossOutliers(lightCurve)) excluded[i] = 1;
  const kept: number[] = [];
  for (let i = 0; i < n; i++) if (excluded[i] === 0 && !flagged(i)) kept.push(lightCurve.value[i]);
  return bulkRange(kept.length > 0 ? kept : lightCurve.value, alsoShow);
}

/** The likely outliers of a robust fit by index (`robust.flagged`; none without robust noise). */
export function robustFlags(flaggedPoints: readonly { readonly index: number }[] | undefined): (index: number) => boolean {
  const indices = new Set((flaggedPoints ?? []).map((point) => point.index));
  return (index) => indices.has(index);
}
