import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { formatLightCurveCsv } from "../../src/lightcurve/light-curve-csv.js";
import { readLightCurves } from "../../src/lightcurve/read-light-curves.js";
import { writeLightCurveCsv } from "../../src/lightcurve/write-light-curve-csv.js";
import { continuousSpaceCadence } from "../../src/lightcurve/cadence.js";
import { photometricErrors } from "../../src/lightcurve/photometric-error.js";
import { createRng } from "../../src/random/rng.js";

function simulated(band?: string): LightCurve {
  const rng = createRng(4);
  const time = continuousSpaceCadence({ start: 2459000.5, duration: 2 }, rng).map((t) => t + 1e-7 * rng.uniform());
  const value = time.map((t) => 18 + 0.1 * Math.sin(t) + 0.01 * rng.normal());
  return {
    time,
    value,
    error: photometricErrors(value, { depth5Sigma: 22 }),
    unit: "mag",
    ...(band ? { band } : {}),
    provenance: { source: "simulated", timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
  };
}

describe("light-curve CSV writer", () => {
  it("round-trips exactly through the reader, Julian dates included", async () => {
    const lc = simulated();
    const path = join(mkdtempSync(join(tmpdir(), "horologium-csv-")), "sim.csv");
    await writeLightCurveCsv(path, lc, { comments: ["simulated light curve, seed 4"] });
    const { lightCurves, warnings } = await readLightCurves(path);
    expect(warnings).toEqual([]);
    expect(Array.from(lightCurves[0].time)).toEqual(Array.from(lc.time));
    expect(Array.from(lightCurves[0].value)).toEqual(Array.from(lc.value));
    expect(Array.from(lightCurves[0].error!)).toEqual(Array.from(lc.error!));
    expect(lightCurves[0].provenance.errorColumn).toBe("mag_err");
  });

  it("writes a band column for several bands and rounds on request", async () => {
    const text = formatLightCurveCsv([simulated("g"), simulated("r")], { digits: 4 });
    expect(text.split("\n")[0]).toBe("time,band,mag,mag_err");
    expect(text.split("\n")[1]).toMatch(/^2459000\.5\d*,g,18\.\d\d,0\.\d+$/);
    const path = join(mkdtempSync(join(tmpdir(), "horologium-csv-")), "two.csv");
    await writeLightCurveCsv(path, [simulated("g"), simulated("r")]);
    const { lightCurves } = await readLightCurves(path);
    expect(lightCurves.map((l) => l.band)).toEqual(["g", "r"]);
  });

  it("refuses mixed units", () => {
    expect(() => formatLightCurveCsv([simulated(), { ...simulated(), unit: "flux" }])).toThrow(/unit/);
  });
});
