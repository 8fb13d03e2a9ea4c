import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { writeLightCurveCsv } from "../../src/lightcurve/write-light-curve-csv.js";
import { inventedIds, inventedLightCurve } from "./invented-catalogue.js";

/**
 * Writes the invented catalogue as a folder of CSV light curves, one file per object (`lf-NNN.csv`),
 * with the project's own light-curve writer; `failing` ids get the sentinel first value -111 that makes
 * the stand-in fit throw, and `unreadable` ids a file whose reader error names a line and column.
 */
export async function writeInventedFolder(
  folder: string,
  count: number,
  sentinels: { failing?: readonly string[]; unreadable?: readonly string[] } = {},
): Promise<string[]> {
  mkdirSync(folder, { recursive: true });
  const ids = inventedIds(count);
  for (const id of ids) {
    if (sentinels.unreadable?.includes(id)) {
      writeFileSync(join(folder, `${id}.csv`), "time,mag,mag_err\n1,19.1,0.02\n2,abc,0.02\n3,19.2,0.02\n");
      continue;
    }
    await writeLightCurveCsv(join(folder, `${id}.csv`), inventedLightCurve(id, 30, sentinels.failing?.includes(id) ? -111 : undefined));
  }
  return ids;
}
