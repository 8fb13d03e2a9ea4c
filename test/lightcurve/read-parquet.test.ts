import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parquetWriteBuffer } from "hyparquet-writer";
import { describe, expect, it } from "vitest";
import type { InputError } from "../../src/errors/input-error.js";
import { oneLineInputErrorAsync } from "../helpers/one-line-input-error.js";
import { parseParquetLightCurves } from "../../src/lightcurve/parquet-light-curve.js";
import { readLightCurves } from "../../src/lightcurve/read-light-curves.js";

type Column = { name: string; data: unknown[]; type?: string };

/** Parquet bytes written by hyparquet-writer, an independent Parquet implementation. */
function parquet(columns: Column[]): Uint8Array {
  return new Uint8Array(parquetWriteBuffer({ columnData: columns as never }));
}

const mjd = [60100.1, 60101.2, 60102.15, 60104.3, 60107.05, 60109.4];
function basic(): Column[] {
  return [
    { name: "mjd", data: mjd, type: "DOUBLE" },
    { name: "flux", data: [310.5, 298.1, 305.7, 322.9, 315.2, 301.4], type: "DOUBLE" },
    { name: "flux_err", data: [4.1, 4.0, 4.2, 4.3, 4.1, 4.0], type: "DOUBLE" },
  ];
}

function parquetError(bytes: Uint8Array, options = {}): Promise<InputError> {
  return oneLineInputErrorAsync(() => parseParquetLightCurves(bytes, "t.parquet", options));
}

describe("Parquet light curves", () => {
  it("reads recognised columns of a file written by hyparquet-writer", async () => {
    const { lightCurves, warnings } = await parseParquetLightCurves(parquet(basic()), "t.parquet");
    expect(warnings).toEqual([]);
    const lc = lightCurves[0];
    expect(Array.from(lc.time)).toEqual(mjd);
    expect(lc.value[3]).toBe(322.9);
    expect(lc.unit).toBe("flux");
    expect(lc.provenance).toMatchObject({ timeColumn: "mjd", valueColumn: "flux", errorColumn: "flux_err", dropped: 0 });
  });

  it("drops nulls and NaN, splits bands, accepts 64-bit integers and numeric strings", async () => {
    const columns: Column[] = [
      { name: "time", data: [1n, 2n, 3n, 4n, 5n, 6n, 7n, 8n], type: "INT64" },
      { name: "band", data: ["g", "r", "g", "r", "g", "r", "g", "r"], type: "STRING" },
      { name: "mag", data: ["20.1", "19.5", null, "19.6", "20.2", "19.4", "20.0", "19.5"], type: "STRING" },
      { name: "err", data: [0.1, 0.1, 0.1, Number.NaN, 0.1, 0.1, 0.1, 0.1], type: "DOUBLE" },
    ];
    const { lightCurves, warnings } = await parseParquetLightCurves(parquet(columns), "t.parquet", { minimumPoints: 3 });
    expect(lightCurves.map((lc) => [lc.band, lc.time.length, lc.provenance.dropped])).toEqual([
      ["g", 3, 1],
      ["r", 3, 1],
    ]);
    expect(Array.from(lightCurves[1].value)).toEqual([19.5, 19.4, 19.5]);
    expect(warnings.join(" | ")).toMatch(/band "g": dropped 1 row\(s\) with a missing value \(rows 3\)/);
  });

  it("converts timestamps in the time column to MJD with a warning", async () => {
    // MJD 40587 is 1970-01-01T00:00Z (the Unix epoch; common practice).
    const dates = [0, 1, 2, 3, 4.5].map((d) => new Date(Date.UTC(1970, 0, 1) + d * 86_400_000));
    const columns: Column[] = [
      { name: "time", data: dates, type: "TIMESTAMP" },
      { name: "mag", data: [1, 2, 3, 2, 1], type: "DOUBLE" },
    ];
    const { lightCurves, warnings } = await parseParquetLightCurves(parquet(columns), "t.parquet");
    expect(Array.from(lightCurves[0].time)).toEqual([40587, 40588, 40589, 40590, 40591.5]);
    expect(warnings[0]).toMatch(/converted to MJD/);
  });

  it("is chosen by the .parquet extension", async () => {
    const path = join(mkdtempSync(join(tmpdir(), "horologium-pq-")), "obj.parquet");
    writeFileSync(path, parquet(basic()));
    const { lightCurves } = await readLightCurves(path, { convertTo: "mag", zeroPoint: 25 });
    // m = -2.5 log10 f + zp (Pogson).
    expect(lightCurves[0].value[0]).toBeCloseTo(25 - 2.5 * Math.log10(310.5), 12);
  });
});

describe("Parquet error paths", () => {
  it("rejects bytes that are not Parquet", async () => {
    expect((await parquetError(new TextEncoder().encode("PAR1 this is not really parquet PAR1"))).message).toMatch(
      /^t\.parquet: not a readable Parquet file \(.+\)$/,
    );
  });

  it("rejects Parquet whose data pages are corrupt", async () => {
    const bytes = parquet(basic());
    for (let i = 4; i < 12; i++) bytes[i] = 0xff;
    expect((await parquetError(bytes)).message).toMatch(/^t\.parquet: cannot decode the Parquet data \(.+\)$/);
  });

  it("rejects infinities and garbage strings with their row", async () => {
    const inf = basic();
    inf[1] = { ...inf[1], data: [1, 2, Number.POSITIVE_INFINITY, 4, 5, 6] };
    expect((await parquetError(parquet(inf))).message).toBe('t.parquet: row 3: column "flux": Infinity is infinite');
    const garbage = basic();
    garbage[0] = { name: "mjd", data: ["1", "2", "3", "4", "five", "6"], type: "STRING" };
    expect((await parquetError(parquet(garbage))).message).toBe('t.parquet: row 5: column "mjd": "five" is not a number');
  });

  it("rejects booleans where numbers are needed", async () => {
    const columns: Column[] = [...basic().slice(0, 2), { name: "flux_err", data: [true, true, true, true, true, true], type: "BOOLEAN" }];
    expect((await parquetError(parquet(columns))).message).toBe('t.parquet: row 1: column "flux_err": a boolean where a number is needed');
  });

  it("rejects non-positive errors, missing columns and too few points", async () => {
    const bad = basic();
    bad[2] = { ...bad[2], data: [1, 1, 1, -2, 1, 1] };
    expect((await parquetError(parquet(bad))).message).toBe('t.parquet: row 4: column "flux_err": error -2 is not positive');
    expect((await parquetError(parquet(basic()), { valueColumn: "mag" })).message).toBe(
      't.parquet: no value column "mag" (columns: "mjd", "flux", "flux_err")',
    );
    expect((await parquetError(parquet(basic()), { minimumPoints: 10 })).message).toBe(
      "t.parquet: only 6 usable point(s); at least 10 are needed",
    );
  });
});
