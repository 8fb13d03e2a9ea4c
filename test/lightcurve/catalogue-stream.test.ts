import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { parquetWriteBuffer } from "hyparquet-writer";
import { describe, expect, it } from "vitest";
import { streamCatalogue, type CatalogueEntry, type CatalogueStreamOptions } from "../../src/lightcurve/catalogue-stream.js";
import type { InputError } from "../../src/errors/input-error.js";
import { oneLineInputErrorAsync } from "../helpers/one-line-input-error.js";
import { listLightCurveFiles } from "../../src/lightcurve/list-light-curve-files.js";

const fixture = join(import.meta.dirname, "..", "fixtures", "lightcurves", "lantern-catalogue.csv");
const scratch = mkdtempSync(join(tmpdir(), "horologium-cat-"));

async function collect(path: string, options: CatalogueStreamOptions): Promise<CatalogueEntry[]> {
  const out: CatalogueEntry[] = [];
  for await (const entry of streamCatalogue(path, options)) out.push(entry);
  return out;
}

async function streamError(path: string, options: CatalogueStreamOptions): Promise<{ error: InputError; before: string[] }> {
  const before: string[] = [];
  const error = await oneLineInputErrorAsync(async () => {
    for await (const entry of streamCatalogue(path, options)) before.push(entry.id);
  });
  return { error, before };
}

function body(id: string, n: number, start = 0): string {
  let out = "";
  for (let i = 0; i < n; i++) out += `${id},${start + i},${(18 + 0.01 * i).toFixed(2)},0.02\n`;
  return out;
}

describe("streaming catalogue reader", () => {
  it("yields one object at a time with its bands, warnings and problems", async () => {
    const entries = await collect(fixture, { idColumn: "objid" });
    expect(entries.map((e) => e.id)).toEqual(["LDS-0101", "LDS-0102", "LDS-0103"]);
    expect(entries[0].lightCurves.map((lc) => [lc.band, lc.time.length])).toEqual([
      ["g", 5],
      ["r", 5],
    ]);
    expect(entries[0].lightCurve).toBeUndefined();
    expect(entries[1].lightCurve!.time.length).toBe(5);
    expect(entries[1].lightCurve!.provenance.dropped).toBe(1);
    expect(entries[1].warnings).toEqual([`object "LDS-0102": ${fixture}: band "r": dropped 1 row(s) with a missing value (lines 15)`]);
    expect(entries[2].problem).toBe(`object "LDS-0103": ${fixture}: band "r": only 2 usable point(s); at least 5 are needed`);
    const chosen = await collect(fixture, { idColumn: "1", band: "g" });
    expect(chosen[0].lightCurve!.band).toBe("g");
    expect(chosen[1].problem).toMatch(/no rows for band "g"/);
  });

  it("reports a garbage cell as that object's problem and goes on", async () => {
    const path = join(scratch, "garbage.csv");
    writeFileSync(path, "id,mjd,mag,err\n" + body("a", 5) + "b,1,18,0.1\nb,2,oops,0.1\n" + body("b", 5, 3) + body("c", 6));
    const entries = await collect(path, { idColumn: "id" });
    expect(entries.map((e) => [e.id, e.problem ?? "ok"])).toEqual([
      ["a", "ok"],
      ["b", `object "b": ${path}:8: column "mag": "oops" is not a number`],
      ["c", "ok"],
    ]);
  });

  it("reads gzip-compressed and tab-separated catalogues", async () => {
    const path = join(scratch, "cat.tsv.gz");
    writeFileSync(path, gzipSync(Buffer.from(("id,mjd,mag,err\n" + body("x", 5) + body("y", 7)).replace(/,/g, "\t"))));
    const entries = await collect(path, { idColumn: "ID" });
    expect(entries.map((e) => e.lightCurve!.time.length)).toEqual([5, 7]);
  });

  it("streams: objects before a broken line are yielded before the error", async () => {
    const path = join(scratch, "late-error.csv");
    let text = "id,mjd,mag,err\n";
    for (let k = 0; k < 200; k++) text += body(`obj${k}`, 5);
    text += "broken,row\n";
    writeFileSync(path, text);
    const { error, before } = await streamError(path, { idColumn: "id" });
    // Every object finished before the broken line was yielded; the one still open (obj199) cannot be.
    expect(before.length).toBe(199);
    expect(error.message).toBe(`${path}:1002: column "mag": only 2 field(s), expected 4`);
  });

  it("rejects ids that are not contiguous, naming the line", async () => {
    const path = join(scratch, "unsorted.csv");
    writeFileSync(path, "id,mjd,mag,err\n" + body("a", 5) + body("b", 5) + body("a", 1, 9));
    const { error, before } = await streamError(path, { idColumn: "id" });
    expect(before).toEqual(["a"]);
    expect(error.message).toBe(
      `${path}:12: column "id": rows of object "a" are not contiguous (it appeared before another object); sort or group the catalogue by the id column`,
    );
  });

  it("rejects a missing id, an unknown id column, a clash of columns, binary formats and missing files", async () => {
    const path = join(scratch, "noid.csv");
    writeFileSync(path, "id,mjd,mag,err\n" + body("a", 5) + ",9,18,0.1\n");
    expect((await streamError(path, { idColumn: "id" })).error.message).toBe(`${path}:7: column "id": no object id`);
    expect((await streamError(path, { idColumn: "objid" })).error.message).toBe(
      `${path}: no object-id column "objid" (columns: "id", "mjd", "mag", "err")`,
    );
    expect((await streamError(path, { idColumn: "mjd" })).error.message).toMatch(/object-id column is also chosen/);
    expect((await streamError(join(scratch, "x.parquet"), { idColumn: "id" })).error.message).toMatch(/x\.parquet: not a readable Parquet file \(no such file\)/);
    expect((await streamError(join(scratch, "x.fits"), { idColumn: "id" })).error.message).toMatch(/\.fits is not supported here/);
    expect((await streamError(join(scratch, "missing.csv"), { idColumn: "id" })).error.message).toBe(
      `${join(scratch, "missing.csv")}: cannot read the catalogue (no such file)`,
    );
    const bad = join(scratch, "bad.csv.gz");
    writeFileSync(bad, "plain text, not gzip");
    expect((await streamError(bad, { idColumn: "id" })).error.message).toMatch(/not valid gzip data/);
  });
});

describe("listing a folder of light curves", () => {
  it("lists recognised files sorted, skipping hidden ones, optionally recursively", async () => {
    const folder = join(scratch, "folder");
    mkdirSync(join(folder, "deep"), { recursive: true });
    mkdirSync(join(folder, ".hidden"), { recursive: true });
    for (const name of ["b.csv", "a.fits", "c.parquet.gz", "notes.md", ".x.csv", "deep/d.dat", ".hidden/e.csv", "Z.TSV"]) {
      writeFileSync(join(folder, name), "");
    }
    expect(await listLightCurveFiles(folder)).toEqual(["Z.TSV", "a.fits", "b.csv", "c.parquet.gz"].map((n) => join(folder, n)));
    expect(await listLightCurveFiles(folder, { recursive: true })).toEqual(
      ["Z.TSV", "a.fits", "b.csv", "c.parquet.gz", "deep/d.dat"].map((n) => join(folder, n)),
    );
    await expect(listLightCurveFiles(join(folder, "nope"))).rejects.toThrow(/no such folder/);
  });
});

describe("streaming Parquet catalogue reader", () => {
  // Reference: the same catalogue as CSV through the text reader; Parquet bytes written by hyparquet-writer
  // (an independent implementation) with row groups of 7 rows, so that objects straddle row groups.
  const ids: string[] = [];
  const mjd: number[] = [];
  const mag: number[] = [];
  const err: number[] = [];
  let csv = "objid,mjd,mag,mag_err\n";
  ["LDS-2001", "LDS-2002", "LDS-2003", "LDS-2004"].forEach((id, k) => {
    for (let i = 0; i < 6 + 3 * k; i++) {
      const row = [id, 60000 + 1.5 * i + 0.1 * k, 19 + 0.01 * ((i * 7 + k) % 11), 0.02 + 0.001 * k];
      ids.push(row[0] as string);
      mjd.push(row[1] as number);
      mag.push(row[2] as number);
      err.push(row[3] as number);
      csv += row.join(",") + "\n";
    }
  });
  const write = (name: string, idData: unknown[], magData: unknown[] = mag): string => {
    const path = join(scratch, name);
    const columnData = [
      { name: "objid", data: idData, type: "STRING" },
      { name: "mjd", data: mjd, type: "DOUBLE" },
      { name: "mag", data: magData, type: magData.some((v) => typeof v === "string") ? "STRING" : "DOUBLE" },
      { name: "mag_err", data: err, type: "DOUBLE" },
    ];
    writeFileSync(path, new Uint8Array(parquetWriteBuffer({ columnData: columnData as never, rowGroupSize: 7 })));
    return path;
  };

  it("yields the same objects as the CSV of the same table, one at a time across row groups", async () => {
    const csvPath = join(scratch, "parquet-twin.csv");
    writeFileSync(csvPath, csv);
    const fromCsv = await collect(csvPath, { idColumn: "objid" });
    const fromParquet = await collect(write("catalogue.parquet", ids), { idColumn: "objid" });
    expect(fromParquet.map((e) => e.id)).toEqual(["LDS-2001", "LDS-2002", "LDS-2003", "LDS-2004"]);
    fromParquet.forEach((entry, k) => {
      expect(Array.from(entry.lightCurve!.time)).toEqual(Array.from(fromCsv[k].lightCurve!.time));
      expect(Array.from(entry.lightCurve!.value)).toEqual(Array.from(fromCsv[k].lightCurve!.value));
      expect(Array.from(entry.lightCurve!.error!)).toEqual(Array.from(fromCsv[k].lightCurve!.error!));
    });
  });

  it("names the row of an id that is not contiguous, and keeps going past a bad cell", async () => {
    const shuffled = [...ids];
    shuffled[shuffled.length - 1] = "LDS-2001";
    const { error, before } = await streamError(write("scattered.parquet", shuffled), { idColumn: "objid" });
    expect(error.message).toMatch(/not contiguous/);
    expect(error.message).toContain(`row ${ids.length}`);
    expect(before).toEqual(["LDS-2001", "LDS-2002", "LDS-2003"]);
    const garbled: unknown[] = mag.map(String);
    garbled[8] = "bright";
    const entries = await collect(write("garbled.parquet", ids, garbled), { idColumn: "objid" });
    expect(entries.map((e) => e.problem === undefined)).toEqual([true, false, true, true]);
    expect(entries[1].problem).toMatch(/"bright" is not a number/);
    expect(entries[1].problem).toContain("row 9");
  });
});
