import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeReport, type WrittenReport } from "../../src/report/write-report.js";
import { launchChromium, skipWithoutChromium, watchPage, type HeadlessBrowser } from "../helpers/headless-chromium.js";
import { inventedReportInput } from "./invented-input.js";

interface FigureCheck {
  readonly id: string | null;
  readonly width: number;
  readonly height: number;
  readonly markSets: number;
  readonly drawnMarks: number;
  readonly texts: string[];
}

describe.skipIf(skipWithoutChromium)("the HTML report in headless Chromium", () => {
  let dir = "";
  let chromium: HeadlessBrowser | undefined;
  let written: WrittenReport;
  let consoleErrors: string[] = [];
  let outsideRequests: string[] = [];
  let figures: FigureCheck[] = [];
  let warningsVisible = false;

  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), "horologium-browser-"));
    written = await writeReport(inventedReportInput({ chains: 4, steps: 200 }), dir);
    chromium = await launchChromium();
    const page = await chromium.context.newPage();
    const watch = watchPage(page, "file:");
    consoleErrors = watch.consoleErrors;
    outsideRequests = watch.offOriginRequests;
    await page.goto(pathToFileURL(written.html).href, { waitUntil: "load" });
    figures = await page.evaluate(() =>
      Array.from(document.querySelectorAll("figure svg")).map((svg) => {
        const box = svg.getBoundingClientRect();
        const sets = Array.from(svg.querySelectorAll("g.role-mark"));
        let drawnMarks = 0;
        for (const set of sets) {
          for (const item of Array.from(set.children)) {
            const b = (item as SVGGraphicsElement).getBBox();
            if (b.width > 0 || b.height > 0) drawnMarks++;
          }
        }
        return {
          id: svg.getAttribute("data-figure"),
          width: box.width,
          height: box.height,
          markSets: sets.length,
          drawnMarks,
          texts: Array.from(svg.querySelectorAll("text")).map((t) => t.textContent ?? ""),
        };
      }),
    );
    warningsVisible = await page.locator("#warnings").isVisible();
  });

  afterAll(async () => {
    await chromium?.close();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("loads with no console errors and asks for nothing beyond the file", () => {
    expect(consoleErrors).toEqual([]);
    expect(outsideRequests).toEqual([]);
  });

  it("draws every figure at a non-zero size with marks in it", () => {
    expect(figures.map((f) => f.id)).toEqual([
      "figure-light-curve",
      "figure-corner",
      "figure-spectrum",
      "figure-traces",
    ]);
    for (const figure of figures) {
      expect(figure.width, figure.id!).toBeGreaterThan(100);
      expect(figure.height, figure.id!).toBeGreaterThan(100);
      expect(figure.markSets, figure.id!).toBeGreaterThan(0);
      // At least a band, a median and a periodogram line (the sparsest figure, the spectrum).
      expect(figure.drawnMarks, figure.id!).toBeGreaterThanOrEqual(3);
    }
    // Every measurement is a drawn symbol (plus its error bar and the prediction).
    expect(figures[0].drawnMarks).toBeGreaterThanOrEqual(2 * inventedReportInput({ chains: 1, steps: 2 }).lightCurve.time.length);
  });

  it("shows the axis titles with their units and the warnings box", () => {
    const texts = (id: string) => figures.find((f) => f.id === id)!.texts;
    expect(texts("figure-light-curve")).toContain("Magnitude [mag]");
    expect(texts("figure-corner")).toContain("τ [d]");
    expect(texts("figure-spectrum")).toContain("Frequency [cycles / d]");
    expect(texts("figure-traces")).toContain("Kept step (after warm-up)");
    expect(warningsVisible).toBe(true);
  });
});
