import { writeFile } from "node:fs/promises";
import type { LightCurve } from "./light-curve.js";
import { formatLightCurveCsv, type LightCurveCsvOptions } from "./light-curve-csv.js";

/**
 * Writes light curves to a CSV file (Node) in the layout of {@link formatLightCurveCsv}; the readers
 * read it back unchanged.
 */
export async function writeLightCurveCsv(
  path: string,
  lightCurves: LightCurve | readonly LightCurve[],
  options: LightCurveCsvOptions = {},
): Promise<void> {
  await writeFile(path, formatLightCurveCsv(lightCurves, options), "utf-8");
}
