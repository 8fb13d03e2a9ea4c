import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { parseFitsBinaryTables } from "../../src/lightcurve/fits-binary-table.js";
import { parseFitsLightCurves } from "../../src/lightcurve/fits-light-curve.js";
import type { InputError } from "../../src/errors/input-error.js";
import { readLightCurves } from "../../src/lightcurve/read-light-curves.js";
import { oneLineInputError } from "../helpers/one-line-input-error.js";
import { bintableHdu, card, concat, headerBytes, primaryHdu, type ColumnSpec } from "./fits-builder.js";

const mjd = [59000.5, 59001.5, 59003.25, 59007.75, 59010.125, 59012.5];
const mag = [18.1, 18.25, 18.05, 17.9, 18.3, 18.15];
const err = [0.02, 0.03, 0.02, 0.025, 0.03, 0.02];

function basicColumns(): ColumnSpec[] {
  return [
    { name: "MJD", form: "D", unit: "d", values: mjd },
    { name: "MAG", form: "E", unit: "mag", values: mag },
    { name: "MAG_ERR", form: "E", unit: "mag", values: err },
  ];
}

function fits(columns: ColumnSpec[], options?: Parameters<typeof bintableHdu>[1]): Uint8Array {
  return concat([primaryHdu(), bintableHdu(columns, options)]);
}

function fitsError(bytes: Uint8Array, options = {}): InputError {
  return oneLineInputError(() => parseFitsLightCurves(bytes, "t.fits", options));
}

describe("FITS test files follow the standard's layout", () => {
  it("writes fixed-format cards and 2880-byte blocks", () => {
    // FITS Standard 4.0 sect. 4.2.3-4.2.4: fixed-format integers and logicals end in column 30;
    // sect. 4.2.1.1: a string starts with a quote in column 11 and has at least 8 characters.
    expect(card("NAXIS", 2)).toBe("NAXIS   =                    2" + " ".repeat(50));
    expect(card("SIMPLE", true).slice(29, 30)).toBe("T");
    expect(card("XTENSION", "BINTABLE").slice(10, 20)).toBe("'BINTABLE'");
    expect(card("TFORM1", "D").slice(10, 20)).toBe("'D       '");
    const bytes = fits(basicColumns());
    expect(bytes.length % 2880).toBe(0);
    // One header block and no data for the primary HDU; one header and one data block for the table.
    expect(bytes.length).toBe(3 * 2880);
  });
});

describe("FITS binary tables", () => {
  it("reads D, E columns with recognised names and the unit from TUNIT", () => {
    const { lightCurves, warnings } = parseFitsLightCurves(fits(basicColumns(), { extname: "LIGHTCURVE" }), "t.fits");
    expect(warnings).toEqual([]);
    const lc = lightCurves[0];
    expect(Array.from(lc.time)).toEqual(mjd);
    // E is IEEE single precision: values agree to float32 rounding.
    for (let i = 0; i < mag.length; i++) expect(lc.value[i]).toBeCloseTo(mag[i], 5);
    expect(lc.unit).toBe("mag");
    expect(lc.provenance).toMatchObject({ timeColumn: "MJD", valueColumn: "MAG", errorColumn: "MAG_ERR", dropped: 0 });
    const tables = parseFitsBinaryTables(fits(basicColumns(), { extname: "LIGHTCURVE" }), "t.fits");
    expect(tables[0].name).toBe("LIGHTCURVE");
    expect(tables[0].hduIndex).toBe(1);
    expect(tables[0].rowBytes).toBe(16);
  });

  it("takes the unit from TUNIT when the column name does not say", () => {
    const columns: ColumnSpec[] = [
      { name: "TIME", form: "D", values: mjd },
      { name: "VALUE", form: "D", unit: "e-/s", values: mag.map((m) => 10 ** (-0.4 * (m - 25))) },
    ];
    const { lightCurves, warnings } = parseFitsLightCurves(fits(columns), "t.fits");
    expect(lightCurves[0].unit).toBe("flux");
    expect(warnings).toEqual([]);
  });

  it("applies TSCAL/TZERO and TNULL, treats NaN floats as missing, reads K, I, B and A columns", () => {
    // Standard 4.0 sect. 7.3.2: physical = TZERO + TSCAL x stored; TNULLn marks undefined integers.
    const columns: ColumnSpec[] = [
      { name: "t", form: "J", tscal: 0.001, tzero: 59000, values: [500, 1500, 3250, 7750, 10125, 12500] },
      { name: "flux", form: "I", tzero: 32768, tnull: -32768, values: [1000 - 32768, 2000 - 32768, -32768, 4000 - 32768, 5000 - 32768, 60000 - 32768] },
      { name: "flux_err", form: "E", values: [10, Number.NaN, 10, 10, 10, 10] },
      { name: "band", form: "4A", values: ["ab", "ab", "ab", "ab", "ab", "ab"] },
      { name: "id", form: "K", values: [1n, 2n, 3n, 4n, 5n, 2n ** 40n] },
      { name: "quality", form: "B", values: [0, 0, 1, 0, 255, 0] },
    ];
    const { lightCurves, warnings } = parseFitsLightCurves(fits(columns), "t.fits", { minimumPoints: 3 });
    const lc = lightCurves[0];
    expect(lc.band).toBe("ab");
    expect(Array.from(lc.time)).toEqual([59000.5, 59007.75, 59010.125, 59012.5].map((t) => expect.closeTo(t, 9)));
    expect(Array.from(lc.value)).toEqual([1000, 4000, 5000, 60000]);
    expect(lc.provenance.dropped).toBe(2);
    expect(warnings.join(" ")).toMatch(/dropped 2 row\(s\) with a missing value \(rows 2, 3\)/);
    const wide = parseFitsLightCurves(fits(columns), "t.fits", { timeColumn: "id", valueColumn: "quality", errorColumn: null, unit: "flux", minimumPoints: 3 });
    expect(wide.lightCurves[0].time[5]).toBe(2 ** 40);
    expect(wide.lightCurves[0].value[4]).toBe(255);
  });

  it("skips a primary image and uses the first table with recognisable columns", () => {
    const other = bintableHdu([{ name: "ENERGY", form: "E", values: [1, 2] }], { extname: "SPECTRUM" });
    const bytes = concat([primaryHdu(3000), other, bintableHdu(basicColumns())]);
    const { lightCurves } = parseFitsLightCurves(bytes, "t.fits");
    expect(lightCurves[0].time.length).toBe(6);
    expect(parseFitsBinaryTables(bytes, "t.fits").map((t) => t.hduIndex)).toEqual([1, 2]);
  });

  it("reads .fits and .fit.gz files through readLightCurves", async () => {
    const dir = mkdtempSync(join(tmpdir(), "horologium-fits-"));
    writeFileSync(join(dir, "a.fits"), fits(basicColumns()));
    writeFileSync(join(dir, "b.fit.gz"), gzipSync(fits(basicColumns())));
    expect((await readLightCurves(join(dir, "a.fits"))).lightCurves[0].time.length).toBe(6);
    expect((await readLightCurves(join(dir, "b.fit.gz"))).lightCurves[0].time.length).toBe(6);
  });
});

describe("FITS error paths", () => {
  it("rejects a file that is not FITS", () => {
    expect(fitsError(new TextEncoder().encode("mjd,mag\n1,2\n".repeat(300))).message).toBe(
      "t.fits: not a FITS file (it does not start with a SIMPLE = T card)",
    );
    const notSimple = headerBytes([card("SIMPLE", false), card("BITPIX", 8), card("NAXIS", 0)]);
    expect(fitsError(notSimple).message).toMatch(/SIMPLE is not T/);
  });

  it("rejects a header without END", () => {
    const bytes = concat([primaryHdu(), headerBytes([card("XTENSION", "BINTABLE"), card("BITPIX", 8)], false)]);
    expect(fitsError(bytes).message).toBe("t.fits: HDU 1: the header has no END card (truncated or not FITS)");
  });

  it("rejects data cut short", () => {
    const big = fits(Array.from({ length: 3 }, (_, k) => ({ name: ["mjd", "mag", "err"][k], form: "D", values: Array.from({ length: 400 }, (_, i) => i + 1) })));
    expect(fitsError(big.subarray(0, big.length - 2880)).message).toMatch(/^t\.fits: HDU 1: the file ends inside the data \(needs \d+ bytes, has \d+\)$/);
  });

  it("rejects a file without a binary table", () => {
    expect(fitsError(primaryHdu(100)).message).toBe("t.fits: the FITS file has no binary-table extension (BINTABLE)");
  });

  it("rejects bad BITPIX, missing mandatory keywords, invalid TFORM and a wrong NAXIS1", () => {
    const badBitpix = concat([headerBytes([card("SIMPLE", true), card("BITPIX", 12), card("NAXIS", 0)])]);
    expect(fitsError(badBitpix).message).toMatch(/BITPIX = 12 is not one of/);
    expect(fitsError(fits(basicColumns(), { omit: ["NAXIS2"] })).message).toBe("t.fits: HDU 1: keyword NAXIS2 is missing");
    expect(fitsError(fits(basicColumns(), { omit: ["TFIELDS"] })).message).toBe("t.fits: HDU 1: keyword TFIELDS is missing");
    expect(fitsError(fits(basicColumns(), { omit: ["TFORM2"] })).message).toBe('t.fits: column "MAG": HDU 1: keyword TFORM2 is missing');
    const badForm = fits([...basicColumns().slice(0, 2), { name: "MAG_ERR", form: "Z", values: err }]);
    // The builder writes a width of 0 for the unknown type, so only the TFORM check can catch it.
    expect(fitsError(badForm).message).toBe(`t.fits: column "MAG_ERR": HDU 1: TFORM3 = 'Z' is not a valid binary-table format`);
    expect(fitsError(fits(basicColumns(), { naxis1Override: 20 })).message).toBe(
      "t.fits: HDU 1: the columns take 16 bytes per row but NAXIS1 = 20",
    );
  });

  it("rejects vector and variable-length columns when they are chosen", () => {
    const columns: ColumnSpec[] = [
      ...basicColumns(),
      { name: "APER", form: "3D", values: mjd.map(() => [1, 2, 3]) },
      { name: "SPEC", form: "1PD(4)", values: mjd.map(() => 0) },
    ];
    expect(parseFitsLightCurves(fits(columns), "t.fits").lightCurves[0].time.length).toBe(6);
    expect(fitsError(fits(columns), { valueColumn: "APER" }).message).toBe(
      't.fits: column "APER": column holds vectors of 3 elements; choose a scalar numeric column',
    );
    expect(fitsError(fits(columns), { errorColumn: "SPEC" }).message).toBe(
      't.fits: column "SPEC": column has type P, which Horologium does not read; choose a scalar numeric column',
    );
  });

  it("rejects infinities, garbage text and logicals with their row", () => {
    const inf = basicColumns();
    inf[1] = { ...inf[1], values: [18, 18, 18, Number.POSITIVE_INFINITY, 18, 18] };
    expect(fitsError(fits(inf)).message).toBe('t.fits: row 4: column "MAG": Infinity is infinite');
    const text: ColumnSpec[] = [basicColumns()[0], { name: "mag", form: "6A", values: ["18.1", "18.2", "bright", "18", "18", "18"] }];
    expect(fitsError(fits(text)).message).toBe('t.fits: row 3: column "mag": "bright" is not a number');
    const logical: ColumnSpec[] = [basicColumns()[0], { name: "mag", form: "L", values: mjd.map(() => true) }];
    const e = fitsError(fits(logical));
    expect([e.row, e.column]).toEqual([1, "mag"]);
  });

  it("rejects non-positive errors and too few rows with the row number", () => {
    const zero = basicColumns();
    zero[2] = { ...zero[2], values: [0.02, 0.02, 0.02, 0.02, 0, 0.02] };
    expect(fitsError(fits(zero)).message).toBe('t.fits: row 5: column "MAG_ERR": error 0 is not positive');
    expect(fitsError(fits(basicColumns()), { minimumPoints: 7 }).message).toBe("t.fits: only 6 usable point(s); at least 7 are needed");
  });

  it("rejects an unterminated string value", () => {
    const broken = card("EXTNAME", "X").replace(/'X {7}'/, "'X       ");
    const bytes = concat([primaryHdu(), bintableHdu(basicColumns()).subarray(0, 0), headerBytes([
      card("XTENSION", "BINTABLE"), card("BITPIX", 8), card("NAXIS", 2), card("NAXIS1", 0), card("NAXIS2", 0),
      card("PCOUNT", 0), card("GCOUNT", 1), card("TFIELDS", 0), broken,
    ])]);
    expect(fitsError(bytes).message).toBe("t.fits: HDU 1: keyword EXTNAME has an unterminated string");
  });
});

describe("shipped binary fixtures", () => {
  it("hold the same light curves as their text versions", async () => {
    const dir = join(import.meta.dirname, "..", "fixtures", "lightcurves");
    const fitsSet = await readLightCurves(join(dir, "lantern-q0007.fits"));
    const csvSet = await readLightCurves(join(dir, "lantern-q0007.csv"));
    expect(Array.from(fitsSet.lightCurves[0].value)).toEqual(Array.from(csvSet.lightCurves[0].value));
    const pq = await readLightCurves(join(dir, "lantern-s0112.parquet"), { minimumPoints: 3 });
    const tsv = await readLightCurves(join(dir, "lantern-s0112.tsv"), { minimumPoints: 3 });
    expect(Array.from(pq.lightCurves[0].time)).toEqual(Array.from(tsv.lightCurves[0].time));
  });
});
