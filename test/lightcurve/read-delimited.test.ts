import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { parseDelimitedLightCurves } from "../../src/lightcurve/delimited-light-curve.js";
import { InputError } from "../../src/errors/input-error.js";
import { oneLineInputError, oneLineInputErrorAsync } from "../helpers/one-line-input-error.js";
import { readLightCurves } from "../../src/lightcurve/read-light-curves.js";

const fixtures = join(import.meta.dirname, "..", "fixtures", "lightcurves");
const scratch = mkdtempSync(join(tmpdir(), "horologium-lc-"));

/** Writes a scratch file and returns its path. */
function scratchFile(name: string, content: string | Uint8Array): string {
  const path = join(scratch, name);
  writeFileSync(path, content);
  return path;
}

/** Rows of a valid light curve body, `n` lines of "t,mag,err". */
function rows(n: number, start = 0): string {
  let out = "";
  for (let i = 0; i < n; i++) out += `${start + i * 1.5},${(18 + 0.01 * i).toFixed(3)},0.02\n`;
  return out;
}

describe("delimited text: layouts", () => {
  it("reads a CSV with a comment line and recognised columns", async () => {
    const path = join(fixtures, "lantern-q0007.csv");
    const { lightCurves, warnings } = await readLightCurves(path);
    expect(warnings).toEqual([]);
    expect(lightCurves).toHaveLength(1);
    const lc = lightCurves[0];
    expect(lc.time.length).toBe(8);
    expect(lc.time[0]).toBe(59001.312);
    expect(lc.value[7]).toBe(19.839);
    expect(lc.error![2]).toBe(0.033);
    expect(lc.unit).toBe("mag");
    expect(lc.band).toBeUndefined();
    expect(lc.provenance).toEqual({
      source: path,
      timeColumn: "mjd",
      valueColumn: "mag",
      errorColumn: "mag_err",
      dropped: 0,
      placeholders: 0,
      sorted: false,
    });
  });

  it("reads a TSV of fluxes and takes the unit from the column name", async () => {
    const { lightCurves } = await readLightCurves(join(fixtures, "lantern-s0112.tsv"), { minimumPoints: 3 });
    const lc = lightCurves[0];
    expect(lc.unit).toBe("flux");
    expect(lc.provenance.errorColumn).toBe("flux_err");
    expect(lc.value[2]).toBe(1510.9);
  });

  it("reads whitespace columns with the header in a comment line", async () => {
    const { lightCurves } = await readLightCurves(join(fixtures, "lantern-v0044.dat"));
    const lc = lightCurves[0];
    expect(lc.provenance.timeColumn).toBe("mjd");
    expect(lc.provenance.errorColumn).toBe("err");
    expect(lc.time.length).toBe(6);
    expect(lc.value[3]).toBe(17.36);
  });

  it("reads a headerless table as time, value, error and warns about the assumed unit", () => {
    const { lightCurves, warnings } = parseDelimitedLightCurves(rows(6), "plain.txt");
    expect(lightCurves[0].provenance.timeColumn).toBe("1");
    expect(lightCurves[0].provenance.errorColumn).toBe("3");
    expect(lightCurves[0].unit).toBe("mag");
    expect(warnings.join(" ")).toMatch(/assuming magnitudes/);
    // A two-column headerless table has no error column.
    const two = parseDelimitedLightCurves("1 5\n2 6\n3 5\n4 7\n5 6\n", "two.dat", { unit: "flux" });
    expect(two.lightCurves[0].error).toBeUndefined();
    expect(two.warnings).toEqual([]);
  });

  it("detects semicolons and quoted fields, CRLF line ends and a byte-order mark", () => {
    const text = '\uFEFF"time";"value";"sigma"\r\n' + rows(5).replace(/,/g, ";").replace(/\n/g, "\r\n");
    const { lightCurves } = parseDelimitedLightCurves(text, "q.csv", { unit: "mag" }, ",");
    expect(lightCurves[0].provenance.valueColumn).toBe("value");
    expect(lightCurves[0].provenance.errorColumn).toBe("sigma");
    expect(lightCurves[0].time.length).toBe(5);
    const quoted = parseDelimitedLightCurves('t,y,err,note\n' + '1,2,0.1,"a, b"\n2,3,0.1,"say ""hi"""\n3,2,0.1,x\n4,1,0.1,x\n5,2,0.1,x\n', "q.csv");
    expect(quoted.lightCurves[0].value[1]).toBe(3);
  });

  it("accepts Fortran D exponents and signs", () => {
    const { lightCurves } = parseDelimitedLightCurves("t,flux\n1,1.5D+02\n2,-2.0e1\n3,+3\n4,.5\n5,6.\n", "d.csv");
    expect(Array.from(lightCurves[0].value)).toEqual([150, -20, 3, 0.5, 6]);
  });
});

describe("delimited text: explicit columns and units", () => {
  const text = "obs_time,MAG_AUTO,MAGERR_AUTO,FLUX_AUTO\n" + "1,18,0.02,100\n2,18.1,0.02,95\n3,18.2,0.03,90\n4,18.1,0.02,96\n5,18,0.02,101\n";

  it("uses explicit column names, case-insensitively, and column numbers", () => {
    const byName = parseDelimitedLightCurves(text, "x.csv", { timeColumn: "obs_time", valueColumn: "mag_auto", errorColumn: "MAGERR_AUTO" });
    expect(byName.lightCurves[0].provenance.valueColumn).toBe("MAG_AUTO");
    expect(byName.lightCurves[0].unit).toBe("mag");
    const byNumber = parseDelimitedLightCurves(text, "x.csv", { timeColumn: "1", valueColumn: "4" });
    expect(byNumber.lightCurves[0].provenance.valueColumn).toBe("FLUX_AUTO");
    expect(byNumber.lightCurves[0].unit).toBe("flux");
    expect(byNumber.lightCurves[0].error).toBeUndefined();
  });

  it("leaves out the error column when asked", () => {
    const { lightCurves } = parseDelimitedLightCurves(join("", "mjd,mag,err\n") + rows(5), "x.csv", { errorColumn: null });
    expect(lightCurves[0].error).toBeUndefined();
    expect(lightCurves[0].provenance.errorColumn).toBeNull();
  });

  it("pairs error columns with their value column", () => {
    // "mag" does not take "flux_err"; "flux" does not take "mag_err".
    const a = parseDelimitedLightCurves("mjd,mag,flux_err\n" + rows(5), "x.csv");
    expect(a.lightCurves[0].provenance.errorColumn).toBeNull();
    const b = parseDelimitedLightCurves("mjd,flux,mag_err,flux_err\n" + rows(5).replace(/\n/g, ",0.5\n"), "x.csv");
    expect(b.lightCurves[0].provenance.errorColumn).toBe("flux_err");
    // Preference follows the documented order (docs/architecture.md, "Command line"): time before mjd, mag before flux.
    const c = parseDelimitedLightCurves("mjd,time,flux,mag\n" + rows(5).replace(/\n/g, ",0.5\n"), "x.csv");
    expect(c.lightCurves[0].provenance.timeColumn).toBe("time");
    expect(c.lightCurves[0].provenance.valueColumn).toBe("mag");
  });

  it("converts fluxes to magnitudes with error propagation", () => {
    const text = "t,flux,flux_err\n1,100,1\n2,1000,10\n3,100,2\n4,10,0.1\n5,100,1\n";
    const { lightCurves } = parseDelimitedLightCurves(text, "f.csv", { convertTo: "mag", zeroPoint: 25 });
    const lc = lightCurves[0];
    expect(lc.unit).toBe("mag");
    // m = -2.5 log10 f + zp; sigma_m = 2.5 / ln 10 * sigma_f / f (Pogson; first-order propagation).
    expect(lc.value[1]).toBeCloseTo(17.5, 12);
    expect(lc.error![0]).toBeCloseTo(0.0108574, 6);
    const bad = oneLineInputError(() => parseDelimitedLightCurves(text.replace("4,10,", "4,-10,"), "f.csv", { convertTo: "mag" }));
    expect(bad.message).toBe('f.csv:5: column "flux": flux -10 is not positive, so it has no magnitude');
  });
});

describe("delimited text: missing values, order, bands", () => {
  it("drops and counts missing values with a warning naming the lines", () => {
    const text = "mjd,mag,err\n1,18,0.1\n2,,0.1\n3,NaN,0.1\n4,18,null\n5,18,0.1\n6,18,0.1\n7,18,0.1\n8,18.2,0.1\n";
    const { lightCurves, warnings } = parseDelimitedLightCurves(text, "m.csv");
    expect(lightCurves[0].provenance.dropped).toBe(3);
    expect(lightCurves[0].time.length).toBe(5);
    expect(warnings).toEqual(["m.csv: dropped 3 row(s) with a missing value (lines 3, 4, 5)"]);
  });

  it("sorts unsorted times, keeps repeated times in file order", () => {
    const text = "mjd,mag,err\n5,15,0.1\n1,11,0.1\n3,13,0.1\n3,13.5,0.1\n2,12,0.1\n";
    const { lightCurves, warnings } = parseDelimitedLightCurves(text, "u.csv");
    expect(Array.from(lightCurves[0].time)).toEqual([1, 2, 3, 3, 5]);
    expect(Array.from(lightCurves[0].value)).toEqual([11, 12, 13, 13.5, 15]);
    expect(lightCurves[0].provenance.sorted).toBe(true);
    expect(warnings.join(" ")).toMatch(/sorted by time/);
  });

  it("gives one light curve per band, or the chosen band", async () => {
    const path = join(fixtures, "lantern-m0031.csv");
    const all = await readLightCurves(path);
    expect(all.lightCurves.map((lc) => lc.band)).toEqual(["g", "r"]);
    expect(all.lightCurves[1].value[0]).toBe(20.02);
    expect(all.lightCurves[0].provenance.errorColumn).toBe("magerr");
    const r = await readLightCurves(path, { band: "r" });
    expect(r.lightCurves).toHaveLength(1);
    expect(r.lightCurves[0].band).toBe("r");
    expect(r.lightCurves[0].time.length).toBe(6);
    const missing = await oneLineInputErrorAsync(() => readLightCurves(path, { band: "z" }));
    expect(missing.message).toBe(`${path}: column "band": no rows for band "z" (bands present: g, r)`);
  });

  it("uses an explicit band column", () => {
    const text = "t,flt,mag,err\n1,a,1,0.1\n2,a,1,0.1\n3,b,2,0.1\n4,b,2,0.1\n5,a,1,0.1\n6,b,2,0.1\n";
    const { lightCurves } = parseDelimitedLightCurves(text, "b.csv", { bandColumn: "flt", minimumPoints: 3 });
    expect(lightCurves.map((lc) => [lc.band, lc.time.length])).toEqual([
      ["a", 3],
      ["b", 3],
    ]);
  });
});

describe("delimited text: every error path names file, line and column", () => {
  const header = "mjd,mag,err\n";

  it("rejects a garbage cell", () => {
    const e = oneLineInputError(() => parseDelimitedLightCurves(header + rows(3) + "7,abc,0.1\n" + rows(3, 10), "g.csv"));
    expect(e.message).toBe('g.csv:5: column "mag": "abc" is not a number');
    expect([e.file, e.line, e.column]).toEqual(["g.csv", 5, "mag"]);
    // Number() would read these; a table of observations should not.
    for (const cell of ["0x10", "1e", "1,5", "--1"]) {
      expect(() => parseDelimitedLightCurves(header + rows(5) + `9,${cell},0.1\n`, "g.tsv", {}, "\t")).toThrow(InputError);
    }
  });

  it("rejects infinities, written or by overflow", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5) + "9,inf,0.1\n", "i.csv")).message).toBe(
      'i.csv:7: column "mag": "inf" is infinite',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + "-Infinity,1,0.1\n" + rows(5), "i.csv")).message).toBe(
      'i.csv:2: column "mjd": "-Infinity" is infinite',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5) + "9,1,1e999\n", "i.csv")).column).toBe("err");
  });

  it("rejects zero and negative errors", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5) + "9,18,0\n", "e.csv")).message).toBe(
      'e.csv:7: column "err": error 0 is not positive',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + "9,18,-0.1\n" + rows(5), "e.csv")).line).toBe(2);
  });

  it("rejects too few points, counting the dropped ones", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(4), "f.csv")).message).toBe(
      "f.csv: only 4 usable point(s); at least 5 are needed",
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(4) + "9,,0.1\n", "f.csv")).message).toBe(
      "f.csv: only 4 usable point(s) after dropping 1 with missing values; at least 5 are needed",
    );
    expect(parseDelimitedLightCurves(header + rows(4), "f.csv", { minimumPoints: 4 }).lightCurves[0].time.length).toBe(4);
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5), "f.csv", { minimumPoints: 1 })).message).toMatch(
      /minimum number of points/,
    );
    const bands = "mjd,band,mag,err\n1,g,1,0.1\n2,g,1,0.1\n3,g,1,0.1\n1,r,1,0.1\n2,r,1,0.1\n";
    expect(oneLineInputError(() => parseDelimitedLightCurves(bands, "b.csv", { minimumPoints: 3 })).message).toBe(
      'b.csv: band "r": only 2 usable point(s); at least 3 are needed',
    );
  });

  it("rejects a light curve with no spread in time", () => {
    const text = header + "7,1,0.1\n7,2,0.1\n7,3,0.1\n7,4,0.1\n7,5,0.1\n";
    expect(oneLineInputError(() => parseDelimitedLightCurves(text, "s.csv")).message).toBe(
      's.csv: column "mjd": all 5 times are equal (7); a light curve needs a time span',
    );
  });

  it("rejects ragged rows", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(3) + "9,18\n" + rows(3, 20), "r.csv")).message).toBe(
      'r.csv:5: column "err": only 2 field(s), expected 3',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(3) + "9,18,0.1,4\n" + rows(3, 20), "r.csv")).message).toBe(
      "r.csv:5: 4 fields, expected 3",
    );
    // A trailing delimiter is tolerated.
    expect(parseDelimitedLightCurves(header + rows(5).replace(/\n/g, ",\n"), "r.csv").lightCurves[0].time.length).toBe(5);
  });

  it("rejects unknown explicit columns, listing the columns", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5), "c.csv", { valueColumn: "flux" })).message).toBe(
      'c.csv: no value column "flux" (columns: "mjd", "mag", "err")',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5), "c.csv", { bandColumn: "9" })).message).toMatch(/no band column "9"/);
  });

  it("rejects a table without a recognisable time or value column", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves("epoch,mag\n" + rows(5), "n.csv")).message).toBe(
      'n.csv: no time column recognised (looked for time/mjd/jd/bjd/t; columns: "epoch", "mag"); name one with --time-col',
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves("mjd,counts\n" + rows(5), "n.csv")).message).toMatch(/no value column recognised.*--value-col/);
    expect(oneLineInputError(() => parseDelimitedLightCurves("mjd,mag\n" + rows(5), "n.csv", { valueColumn: "mjd" })).message).toMatch(/same column/);
  });

  it("rejects a single-column file, an empty file, a header without data", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves("1\n2\n3\n", "one.txt")).message).toBe(
      "one.txt:1: found fewer than two columns (expected at least time and value, separated by commas, tabs, semicolons, bars or spaces)",
    );
    expect(oneLineInputError(() => parseDelimitedLightCurves("# only a comment\n\n", "empty.csv")).message).toBe("empty.csv: the file has no data lines");
    expect(oneLineInputError(() => parseDelimitedLightCurves("", "empty.csv")).message).toBe("empty.csv: the file has no data lines");
    expect(oneLineInputError(() => parseDelimitedLightCurves(header, "h.csv")).message).toBe("h.csv: no data rows (at least 5 points are needed)");
  });

  it("rejects a band request on a table with no band column", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves(header + rows(5), "b.csv", { band: "g" })).message).toBe(
      'b.csv: a band ("g") was asked for but the table has no band column',
    );
  });

  it("reports missing and unreadable files", async () => {
    const missing = join(scratch, "nope.csv");
    expect((await oneLineInputErrorAsync(() => readLightCurves(missing))).message).toBe(`${missing}: cannot read the file (no such file)`);
    expect((await oneLineInputErrorAsync(() => readLightCurves(scratch))).message).toMatch(/it is a folder/);
    const badGzip = scratchFile("bad.csv.gz", "not gzip at all");
    expect((await oneLineInputErrorAsync(() => readLightCurves(badGzip))).message).toBe(`${badGzip}: the file is not valid gzip data`);
  });
});

describe("readLightCurves: compression and sniffing", () => {
  it("reads gzip-compressed text", async () => {
    const path = scratchFile("obj.csv.gz", gzipSync(Buffer.from("mjd,mag,err\n" + rows(6))));
    const { lightCurves } = await readLightCurves(path);
    expect(lightCurves[0].time.length).toBe(6);
  });

  it("reads text with an unknown extension", async () => {
    const path = scratchFile("obj.lightcurve", "mjd mag err\n" + rows(6).replace(/,/g, " "));
    const { lightCurves } = await readLightCurves(path);
    expect(lightCurves[0].value[5]).toBe(18.05);
  });
});

describe("delimited text: remaining error paths", () => {
  it("rejects a forced delimiter that does not split the table", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves("mjd,mag,err\n" + rows(5), "d.txt", { delimiter: "\t" })).message).toBe(
      "d.txt:1: found fewer than two columns (expected at least time and value, separated by commas, tabs, semicolons, bars or spaces)",
    );
    expect(parseDelimitedLightCurves("mjd|mag|err\n" + rows(5).replace(/,/g, "|"), "d.txt", { delimiter: "|" }).lightCurves).toHaveLength(1);
  });

  it("rejects an error column that is also the time or value column", () => {
    expect(oneLineInputError(() => parseDelimitedLightCurves("mjd,mag,err\n" + rows(5), "c.csv", { errorColumn: "mag" })).message).toBe(
      'c.csv: column "mag": the error column is also chosen as time or value column',
    );
  });

  it("drops rows without a band, with a warning", () => {
    const text = "mjd,band,mag,err\n1,g,1,0.1\n2,,1.1,0.1\n3,g,1.2,0.1\n4,g,1,0.1\n5,null,1,0.1\n6,g,1,0.1\n7,g,1.3,0.1\n";
    const { lightCurves, warnings } = parseDelimitedLightCurves(text, "b.csv");
    expect(lightCurves[0].time.length).toBe(5);
    expect(warnings).toEqual(['b.csv: dropped 2 row(s) with no band in column "band"']);
  });
});
