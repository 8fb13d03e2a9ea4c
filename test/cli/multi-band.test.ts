import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { simulateInterleavedBands } from "../../src/models/simulated-bands.js";
import { createRng } from "../../src/random/rng.js";
import { runInProcess } from "./run-cli-in-process.js";

/** An invented three-band quasar of the Lanternfield Deep Survey, written as CSV with a band column. */
function threeBandFile(dir: string): string {
  const rng = createRng("cli:multi-band");
  const visits = seasonalGroundCadence({ seasons: 2, revisitInterval: 2 }, rng);
  const bands = [
    { name: "g", amplitude: 1, mean: 20.1, depth5Sigma: 24.5 },
    { name: "r", amplitude: 0.8, mean: 19.8, depth5Sigma: 24.2 },
    { name: "i", amplitude: 0.6, mean: 19.6, depth5Sigma: 23.8 },
  ];
  const curves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.25, tau: 80 }), visits, bands, rng, "lds-quasar-gri");
  const lines = ["mjd,mag,mag_err,band"];
  for (const lc of curves) for (let i = 0; i < lc.time.length; i++) lines.push(`${lc.time[i] + 59000},${lc.value[i]},${lc.error![i]},${lc.band}`);
  const path = join(dir, "lds-quasar-gri.csv");
  writeFileSync(path, lines.join("\n") + "\n");
  return path;
}

const budget = ["--max-evaluations", "20000", "--quiet"];

describe("one rule for multi-band files", () => {
  it("fit --bands joint: one JSON object with amplitude.<band> and mean.<band>", async () => {
    const dir = (await runInProcess(["--help"])).cwd;
    const file = threeBandFile(dir);
    const joint = await runInProcess(["fit", file, "--model", "drw", "--bands", "joint", "--report", "joint-report", ...budget], dir);
    expect(joint.code).toBe(0);
    const result = JSON.parse(joint.stdout);
    expect(Array.isArray(result)).toBe(false);
    expect(result.bands.fit).toBe("joint");
    expect(result.bands.names).toEqual(["g", "r", "i"]);
    for (const name of ["tau", "sigma", "amplitude.r", "amplitude.i", "mean.g", "mean.r", "mean.i"]) expect(result.parameters[name]).toBeDefined();
    expect(result.parameters["lag.r"]).toBeUndefined();
    // The report: one light-curve panel per band after the reference band's, amplitudes in the table.
    const html = readFileSync(join(dir, "joint-report", "report.html"), "utf8");
    for (const band of ["g", "r", "i"]) expect(html).toContain(`Band ${band}: light curve and posterior prediction`);
    expect(html).toContain("amplitude.r");

    // predict from the stored joint result: one latent curve per band, with a band column.
    writeFileSync(join(dir, "joint.json"), joint.stdout);
    const predicted = await runInProcess(["predict", file, "--from", "joint.json", "--grid", "59000:59400:100", "--draws", "20", "--quiet"], dir);
    expect(predicted.code).toBe(0);
    const lines = predicted.stdout.trim().split("\n");
    expect(lines[0]).toBe("time,band,mean,sd,lower95,upper95");
    expect(lines.length).toBe(1 + 3 * 5);
    expect(new Set(lines.slice(1).map((line) => line.split(",")[1]))).toEqual(new Set(["g", "r", "i"]));
  }, 120_000);

  it("fit: each band on its own by default (an object of per-band results, as with --bands separate), --band one band, --lags needs the joint model", async () => {
    const dir = (await runInProcess(["--help"])).cwd;
    const file = threeBandFile(dir);
    const separate = await runInProcess(["fit", file, "--model", "drw", ...budget], dir);
    expect(separate.code).toBe(0);
    const perBand = JSON.parse(separate.stdout).perBand;
    expect(Object.keys(perBand)).toEqual(["g", "r", "i"]);
    expect(perBand.r.data.band).toBe("r");

    const one = await runInProcess(["fit", file, "--model", "drw", "--band", "i", ...budget], dir);
    expect(one.code).toBe(0);
    expect(JSON.parse(one.stdout).data.band).toBe("i");

    const wrong = await runInProcess(["fit", file, "--model", "drw", "--bands", "separate", "--lags", ...budget], dir);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr.trim().split("\n")).toHaveLength(1);
    expect(wrong.stderr).toMatch(/--lags needs the joint model/);

    // The joint model has no robust noise: refused in one line, not fitted without it.
    const robust = await runInProcess(["fit", file, "--model", "drw", "--bands", "joint", "--robust", ...budget], dir);
    expect(robust.code).toBe(2);
    expect(robust.stderr.trim().split("\n")).toHaveLength(1);
    expect(robust.stderr).toMatch(/--robust fits one band at a time/);
  }, 120_000);
});
