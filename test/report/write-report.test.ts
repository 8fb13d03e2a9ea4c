import { mkdtemp, readFile, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeReport, type WrittenReport } from "../../src/report/write-report.js";
import { inventedReportInput } from "./invented-input.js";
import { PNG_SIGNATURE, pngSize } from "./svg-marks.js";

let dir = "";
let written: WrittenReport;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "horologium-report-"));
  // A fresh nested directory: writeReport must create it.
  written = await writeReport(inventedReportInput({ chains: 4, steps: 200 }), join(dir, "nested", "qss-0042"));
});

afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe("writeReport", () => {
  it("writes report.html and an SVG and a PNG for every figure", async () => {
    const out = join(dir, "nested", "qss-0042");
    expect(written.html).toBe(join(out, "report.html"));
    const ids = ["light-curve", "corner", "spectrum", "traces"];
    expect(written.figures).toEqual(ids.flatMap((id) => [join(out, "figures", `${id}.svg`), join(out, "figures", `${id}.png`)]));
    expect((await readdir(join(out, "figures"))).sort()).toEqual(ids.flatMap((id) => [`${id}.png`, `${id}.svg`]).sort());
  });
  it("writes valid PNG files whose size matches their SVG at twice the scale", async () => {
    for (const path of written.figures.filter((p) => p.endsWith(".png"))) {
      const png = new Uint8Array(await readFile(path));
      expect(Array.from(png.slice(0, 8))).toEqual(PNG_SIGNATURE);
      const svg = await readFile(path.replace(/\.png$/, ".svg"), "utf8");
      const width = Number(/^<svg[^>]*\swidth="([\d.]+)"/.exec(svg)![1]);
      const height = Number(/^<svg[^>]*\sheight="([\d.]+)"/.exec(svg)![1]);
      expect(pngSize(png)).toEqual({ width: Math.round(2 * width), height: Math.round(2 * height) });
    }
  });
  it("inlines every figure in the page", async () => {
    const html = await readFile(written.html, "utf8");
    expect(html.startsWith("<!DOCTYPE html>")).toBe(true);
    expect(html.match(/<svg\b/g)).toHaveLength(4);
  });
});
