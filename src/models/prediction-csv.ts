/** The columns of a posterior-predictive curve, as `predict` writes them. */
export interface PredictionColumns {
  readonly time: ArrayLike<number>;
  readonly mean: ArrayLike<number>;
  readonly sd: ArrayLike<number>;
  readonly lower95: ArrayLike<number>;
  readonly upper95: ArrayLike<number>;
}

/**
 * Formats a predictive curve as CSV `time,mean,sd,lower95,upper95` with full double precision (the
 * output of `horologium predict` and of the browser page's download).
 */
export function predictionCsv(curve: PredictionColumns): string {
  const lines = ["time,mean,sd,lower95,upper95"];
  for (let i = 0; i < curve.time.length; i++)
    lines.push([curve.time[i], curve.mean[i], curve.sd[i], curve.lower95[i], curve.upper95[i]].map(String).join(","));
  return lines.join("\n") + "\n";
}
