import type { PredictionColumns } from "./prediction-csv.js";

/**
 * Formats the predictive curves of several bands as one CSV `time,band,mean,sd,lower95,upper95`, band after
 * band (what `horologium predict` writes for a multi-band file), with full double precision.
 */
export function bandPredictionCsv(curves: readonly { readonly band: string; readonly curve: PredictionColumns }[]): string {
  const lines = ["time,band,mean,sd,lower95,upper95"];
  for (const { band, curve } of curves)
    for (let i = 0; i < curve.time.length; i++)
      lines.push([String(curve.time[i]), band, ...[curve.mean[i], curve.sd[i], curve.lower95[i], curve.upper95[i]].map(String)].join(","));
  return lines.join("\n") + "\n";
}
