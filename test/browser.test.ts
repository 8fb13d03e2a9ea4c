import { readFileSync } from "node:fs";
import { readFile, writeFile } from "node:fs/promises";
import { builtinModules } from "node:module";
import { join } from "node:path";
import { build, type Plugin } from "vite";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computePeriodogram, fitLightCurve, parseLightCurveBytes, type FitResult } from "../src/browser.js";
import { skipWithoutChromium, watchPage } from "./helpers/headless-chromium.js";
import { servedChromium, type ServedChromium } from "./helpers/served-chromium.js";

const ROOT = new URL("../", import.meta.url).pathname;
const packageJson = JSON.parse(readFileSync(join(ROOT, "package.json"), "utf8")) as {
  exports: Record<string, { browser?: { types: string; default: string } }>;
};

/**
 * Fails the bundle on any Node built-in, instead of Vite's silent empty stand-in. seedrandom's optional
 * `require("crypto")` (for seeding from entropy, which Horologium never does: every seed is explicit) is
 * mapped to nothing by seedrandom's own package.json `browser` field.
 */
const noNodeBuiltins: Plugin = {
  name: "no-node-builtins",
  enforce: "pre",
  resolveId(id, importer) {
    const bare = id.replace(/^node:/, "").split("/")[0];
    const seedrandomCrypto = id === "crypto" && /[\\/]node_modules[\\/]seedrandom[\\/]/.test(importer ?? "");
    if ((id.startsWith("node:") || builtinModules.includes(bare)) && !seedrandomCrypto)
      throw new Error(`${importer ?? "?"} imports the Node built-in "${id}"`);
    return null;
  },
};

/** The first 80 observations of the demo quasar (an invented object). */
function smallCsv(): string {
  const lines = readFileSync(join(ROOT, "demo/lds-j0412-2731-quasar.csv"), "utf8").split("\n");
  const header = lines.findIndex((line) => line.startsWith("time,"));
  return lines.slice(0, header + 81).join("\n") + "\n";
}
const FIT = { model: "drw", seed: 3, maxEvaluations: 20_000 } as const;

describe("the package's browser entry", () => {
  it("is the browser condition of the package's exports, built from src/browser.ts", () => {
    const browser = packageJson.exports["."]?.browser;
    expect(browser).toEqual({ types: "./dist/src/browser.d.ts", default: "./dist/src/browser.js" });
    expect(readFileSync(join(ROOT, "src/browser.ts"), "utf8")).toMatch(/export \* from "\.\/index\.js"/);
  });
});

describe.skipIf(skipWithoutChromium)("the library bundled for the browser, in headless Chromium", () => {
  let served: ServedChromium;

  beforeAll(async () => {
    served = await servedChromium("horologium-bundle-", async (dir) => {
      await build({
        configFile: false,
        logLevel: "silent",
        plugins: [noNodeBuiltins],
        build: {
          outDir: dir,
          emptyOutDir: true,
          target: "es2022",
          lib: { entry: join(ROOT, "src/browser.ts"), formats: ["es"], fileName: () => "horologium.js" },
        },
      });
      await writeFile(join(dir, "index.html"), "<!DOCTYPE html><html><head><link rel=\"icon\" href=\"data:,\"></head><body></body></html>\n");
      return dir;
    });
  });

  afterAll(async () => {
    await served?.close();
  });

  it("bundles with no Node built-in and fits a light curve as Node does", async () => {
    const size = (await readFile(join(served.dir, "horologium.js"))).length;
    expect(size).toBeGreaterThan(100_000);
    const page = await served.chromium.context.newPage();
    const watch = watchPage(page, served.server.origin);
    await page.goto(`${served.server.origin}/index.html`);
    const csv = smallCsv();
    const lags = [0, 0.5, 3, 40, 200, 1000];
    // A string, so that the test runner's module transform leaves the page's dynamic import alone.
    const inBrowser = JSON.parse(
      (await page.evaluate(`(async () => {
        const lib = await import("/horologium.js");
        const set = await lib.parseLightCurveBytes(new TextEncoder().encode(${JSON.stringify(csv)}), "lds-j0412-small.csv", "text");
        const lightCurve = set.lightCurves[0];
        const kernel = lib.kernels.dampedRandomWalk({ sigma: 0.2, tau: 150 });
        return JSON.stringify({
          autocovariance: Array.from(kernel.autocovariance(${JSON.stringify(lags)})),
          power: Array.from(lib.computePeriodogram({ time: lightCurve.time, value: lightCurve.value, error: lightCurve.error }).power),
          result: lib.fitLightCurve(lightCurve, { ...${JSON.stringify(FIT)}, clock: () => 0 }),
        });
      })()`)) as string,
    ) as { autocovariance: number[]; power: number[]; result: FitResult };
    const set = await parseLightCurveBytes(new TextEncoder().encode(csv), "lds-j0412-small.csv", "text");
    const lightCurve = set.lightCurves[0];
    // k(t) = sigma^2 exp(-|t| / tau) (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895).
    lags.forEach((lag, i) => expect(inBrowser.autocovariance[i]).toBeCloseTo(0.04 * Math.exp(-lag / 150), 15));
    const power = computePeriodogram({ time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) }).power;
    let largest = 0;
    for (let i = 0; i < power.length; i++) largest = Math.max(largest, Math.abs(inBrowser.power[i] - power[i]));
    expect(largest).toBeLessThan(1e-12);

    // The same fit in Node. Chromium's Math.exp, sin, pow... are not bit-identical to Node 20's (its V8
    // is newer: measured here, about 5% of Math.exp results differ in the last bit), so the two Markov
    // chains part after a few steps; what must agree is the posterior, within its own spread.
    const inNode = fitLightCurve(lightCurve, { ...FIT, clock: () => 0 });
    expect(inBrowser.result.model).toBe("drw");
    expect(inBrowser.result.data).toEqual(inNode.data);
    expect(Object.keys(inBrowser.result.parameters)).toEqual(Object.keys(inNode.parameters));
    for (const [name, node] of Object.entries(inNode.parameters)) {
      const browser = inBrowser.result.parameters[name];
      expect(browser.median, name).toBeGreaterThan(node["q2.5"]);
      expect(browser.median, name).toBeLessThan(node["q97.5"]);
    }
    expect(watch.consoleErrors).toEqual([]);
    expect(watch.offOriginRequests).toEqual([]);
    await page.close();
  });
});
