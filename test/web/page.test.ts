import { readFile, writeFile } from "node:fs/promises";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { build } from "vite";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { skipWithoutChromium, watchPage, type PageWatch } from "../helpers/headless-chromium.js";
import { servedChromium, type ServedChromium } from "../helpers/served-chromium.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { formatLightCurveCsv } from "../../src/lightcurve/light-curve-csv.js";
import { simulateInterleavedBands } from "../../src/models/simulated-bands.js";
import { createRng } from "../../src/random/rng.js";

/**
 * The browser page end to end: built with the project's Vite configuration (as `npm run build:web`
 * does), served by a plain static server, driven in Debian's headless Chromium. A small light curve and
 * a small sampling budget keep each fit to seconds.
 */
const ROOT = new URL("../../", import.meta.url).pathname;

/** The first 120 observations of the demo quasar (an invented object), to keep the fit short. */
async function smallLightCurve(): Promise<string> {
  const lines = (await readFile(join(ROOT, "demo/lds-j0412-2731-quasar.csv"), "utf8")).split("\n");
  const header = lines.findIndex((line) => line.startsWith("time,"));
  return [...lines.slice(0, header + 121)].join("\n") + "\n";
}

/** An invented quasar seen in three bands visited in turn (90 visits over three seasons), r lagging g by 4 d. */
function threeBandLightCurve(): string {
  const rng = createRng("web:three-bands");
  const visits = seasonalGroundCadence({ start: 60000, seasons: 3, revisitInterval: 4 }, rng).slice(0, 90);
  const bands = [
    { name: "g", amplitude: 1, mean: 20.4, depth5Sigma: 24 },
    { name: "r", amplitude: 0.8, mean: 20.1, lag: 4, depth5Sigma: 24 },
    { name: "i", amplitude: 0.7, mean: 19.9, lag: 6, depth5Sigma: 23.5 },
  ];
  return formatLightCurveCsv(simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.25, tau: 90 }), visits, bands, rng, "LDS Q-3B"));
}

describe.skipIf(skipWithoutChromium)("the browser page", () => {
  let served: ServedChromium;

  beforeAll(async () => {
    served = await servedChromium("horologium-web-", async (dir) => {
      const site = join(dir, "site");
      await build({ configFile: join(ROOT, "web/vite.config.ts"), logLevel: "silent", build: { outDir: site, emptyOutDir: true } });
      return site;
    });
    const dir = served.dir;
    const csv = await smallLightCurve();
    await writeFile(join(dir, "lds-j0412-small.csv"), csv);
    await writeFile(join(dir, "unnamed-columns.csv"), csv.replace("time,mag,mag_err", "epoch,brightness,unc"));
    await writeFile(join(dir, "broken.csv"), "time,mag,mag_err\n60000.1,19.2,0.02\n60001.3,abc,0.02\n60002.2,19.3,0.02\n");
    await writeFile(join(dir, "lds-three-bands.csv"), threeBandLightCurve());
  });

  afterAll(async () => {
    await served?.close();
  });

  async function openPage(): Promise<{ page: Page; watch: PageWatch }> {
    const page = await served.chromium.context.newPage();
    const watch = watchPage(page, served.server.origin);
    await page.goto(`${served.server.origin}/index.html`, { waitUntil: "load" });
    return { page, watch };
  }

  async function fit(page: Page, file: string, model = "drw"): Promise<string> {
    await page.setInputFiles('input[type="file"]', join(served.dir, file));
    await page.selectOption('select[name="model"]', model);
    await page.locator("details summary").click();
    await page.fill('input[name="max-evaluations"]', "30000");
    await page.click('button[type="submit"]');
    await page.waitForFunction(() => ["done", "error", "columns"].includes(document.body.dataset["fitState"] ?? ""), undefined, {
      timeout: 100_000,
    });
    return page.evaluate(() => document.body.dataset["fitState"] ?? "");
  }

  it("fits a light curve, draws the report's figures and offers the result JSON", async () => {
    const { page, watch } = await openPage();
    expect(await page.locator("#privacy").textContent()).toMatch(/no request to any host but the one that served it/);
    expect(await fit(page, "lds-j0412-small.csv")).toBe("done");

    const report = page.frameLocator("#report-frame");
    const figures = await report.locator("figure svg").evaluateAll((svgs) =>
      svgs.map((svg) => ({
        id: svg.getAttribute("data-figure"),
        width: svg.getBoundingClientRect().width,
        marks: svg.querySelectorAll("g.role-mark > *").length,
      })),
    );
    expect(figures.map((f) => f.id)).toEqual(expect.arrayContaining(["figure-light-curve", "figure-corner"]));
    // Chain traces for an MCMC fit; an importance-sampled one (the drw default) draws its weights instead.
    expect(figures.filter((f) => f.id === "figure-traces" || f.id === "figure-importance-weights")).toHaveLength(1);
    for (const figure of figures) {
      expect(figure.width, figure.id ?? "").toBeGreaterThan(100);
      expect(figure.marks, figure.id ?? "").toBeGreaterThan(2);
    }
    expect(await report.locator("#parameters table tbody tr").count()).toBeGreaterThanOrEqual(3);

    const link = page.locator('a[download$=".json"]');
    expect(await link.getAttribute("download")).toBe("lds-j0412-small-drw.json");
    const [download] = await Promise.all([page.waitForEvent("download"), link.click()]);
    const result = JSON.parse(await readFile(await download.path(), "utf8")) as Record<string, any>;
    // The fit-result contract of docs/ (stable keys).
    expect(result["model"]).toBe("drw");
    expect(result["seed"]).toBe(1);
    expect(typeof result["version"]).toBe("string");
    expect(result["data"]).toMatchObject({ n: 120, dropped: 0, timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err" });
    expect(Object.keys(result["parameters"])).toEqual(expect.arrayContaining(["tau", "sigma", "mean"]));
    for (const summary of Object.values(result["parameters"]) as Record<string, number>[]) {
      for (const key of ["median", "mean", "sd", "q2.5", "q16", "q84", "q97.5"]) expect(Number.isFinite(summary[key]), key).toBe(true);
      expect(summary["q2.5"]).toBeLessThanOrEqual(summary["q97.5"]);
    }
    expect(Object.keys(result["diagnostics"])).toEqual(
      expect.arrayContaining(["converged", "rhatMax", "essMin", "autocorrelationTime", "acceptance", "likelihoodEvaluations", "seconds"]),
    );
    expect(Array.isArray(result["warnings"])).toBe(true);

    const [predictions] = await Promise.all([page.waitForEvent("download"), page.locator('a[download$="-predictions.csv"]').click()]);
    const csv = (await readFile(await predictions.path(), "utf8")).trim().split("\n");
    expect(csv[0]).toBe("time,mean,sd,lower95,upper95");
    expect(csv.length).toBeGreaterThan(100);

    expect(watch.consoleErrors).toEqual([]);
    expect(watch.offOriginRequests).toEqual([]);
    if (process.env["HOROLOGIUM_SCREENSHOTS"]) await page.screenshot({ path: join(process.env["HOROLOGIUM_SCREENSHOTS"], "web-page.png"), fullPage: true });
    await page.close();
  });

  it("fits every band of a multi-band file jointly, with lags: one panel per band, a band column in the predictions", async () => {
    const { page, watch } = await openPage();
    await page.check('input[name="lags"]');
    expect(await fit(page, "lds-three-bands.csv")).toBe("done");
    const report = page.frameLocator("#report-frame");
    const ids = await report.locator("figure svg").evaluateAll((svgs) => svgs.map((svg) => svg.getAttribute("data-figure")));
    expect(ids).toEqual(expect.arrayContaining(["figure-light-curve-band-g", "figure-light-curve-band-r", "figure-light-curve-band-i"]));
    const [download] = await Promise.all([page.waitForEvent("download"), page.locator('a[download$=".json"]').click()]);
    const result = JSON.parse(await readFile(await download.path(), "utf8")) as Record<string, any>;
    expect(Object.keys(result["parameters"])).toEqual(expect.arrayContaining(["tau", "amplitude.r", "mean.i", "lag.r", "lag.i"]));
    const [predictions] = await Promise.all([page.waitForEvent("download"), page.locator('a[download$="-predictions.csv"]').click()]);
    const csv = (await readFile(await predictions.path(), "utf8")).trim().split("\n");
    expect(csv[0]).toBe("time,band,mean,sd,lower95,upper95");
    expect(new Set(csv.slice(1).map((line) => line.split(",")[1]))).toEqual(new Set(["g", "r", "i"]));
    if (process.env["HOROLOGIUM_SCREENSHOTS"]) await page.screenshot({ path: join(process.env["HOROLOGIUM_SCREENSHOTS"], "web-page-joint.png"), fullPage: true });
    // The joint model has no robust noise: a one-line error, not a fit without it.
    await page.check('input[name="robust"]');
    await page.click('button[type="submit"]');
    await page.waitForFunction(() => document.body.dataset["fitState"] === "error", undefined, { timeout: 100_000 });
    expect(await page.locator("#error").textContent()).toMatch(/^lds-three-bands\.csv: robust noise fits one band at a time/);
    expect(watch.consoleErrors).toEqual([]);
    expect(watch.offOriginRequests).toEqual([]);
    await page.close();
  });

  it("shows the one-line reading error for a bad file", async () => {
    const { page, watch } = await openPage();
    expect(await fit(page, "broken.csv")).toBe("error");
    const message = await page.locator("#error").textContent();
    expect(message).toMatch(/^broken\.csv:3: column "mag": /);
    expect(message).not.toMatch(/internal error|\n/);
    expect(await page.locator("#results").isHidden()).toBe(true);
    expect(watch.consoleErrors).toEqual([]);
    expect(watch.offOriginRequests).toEqual([]);
    await page.close();
  });

  it("asks which column is which when the names are not recognised, then fits", async () => {
    const { page, watch } = await openPage();
    expect(await fit(page, "unnamed-columns.csv")).toBe("columns");
    expect(await page.locator("#columns").isVisible()).toBe(true);
    expect(await page.locator("#time-col option").allTextContents()).toEqual(["epoch", "brightness", "unc"]);
    await page.selectOption("#value-col", "brightness");
    await page.selectOption("#error-col", "unc");
    await page.click('button[type="submit"]');
    await page.waitForFunction(() => ["done", "error"].includes(document.body.dataset["fitState"] ?? ""), undefined, { timeout: 100_000 });
    expect(await page.locator("#error").textContent()).toBe("");
    expect(await page.evaluate(() => document.body.dataset["fitState"])).toBe("done");
    expect(watch.consoleErrors).toEqual([]);
    expect(watch.offOriginRequests).toEqual([]);
    await page.close();
  });
});
