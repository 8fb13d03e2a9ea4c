import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readResultsTable } from "../../src/batch/results-table-reader.js";
import type { ResultRow } from "../../src/batch/result-row.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { simulateInterleavedBands } from "../../src/models/simulated-bands.js";
import { createRng } from "../../src/random/rng.js";
import { runInProcess } from "../cli/run-cli-in-process.js";
import { PROJECT_ROOT, requireFreshBuild } from "./build-check.js";

// The batch follows the multi-band rule of `fit` (docs/multi-band.md): each band on its own by default,
// --bands joint one shared process, --band NAME one band. Reference: the `fit` verb on the same file
// with the object's seed (the row's `seed` column), whose JSON the row must reproduce number for number.
let folder: string;
let catalogue: string;

/** An invented two-band quasar of the Lanternfield Deep Survey, CSV with a band column. */
function twoBandFile(path: string, seed: string): void {
  const rng = createRng(seed);
  const visits = seasonalGroundCadence({ seasons: 2, revisitInterval: 3 }, rng);
  const bands = [
    { name: "g", amplitude: 1, mean: 20.1, depth5Sigma: 24.5 },
    { name: "r", amplitude: 0.8, mean: 19.8, depth5Sigma: 24.2 },
  ];
  const curves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.25, tau: 80 }), visits, bands, rng, seed);
  const lines = ["mjd,mag,mag_err,band"];
  for (const lc of curves) for (let i = 0; i < lc.time.length; i++) lines.push(`${(lc.time[i] ?? 0) + 59000},${lc.value[i]},${lc.error?.[i]},${lc.band}`);
  writeFileSync(path, lines.join("\n") + "\n");
}

beforeAll(() => {
  requireFreshBuild();
  folder = mkdtempSync(join(tmpdir(), "horologium-batch-bands-"));
  catalogue = join(folder, "lanternfield");
  spawnSync("mkdir", [catalogue]);
  twoBandFile(join(catalogue, "lds-q01.csv"), "batch:bands:1");
  twoBandFile(join(catalogue, "lds-q02.csv"), "batch:bands:2");
});
afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

function batch(args: string[]): { code: number; stderr: string } {
  const result = spawnSync(process.execPath, [join(PROJECT_ROOT, "dist", "src", "cli", "bin.js"), "batch", catalogue, ...args, "--quiet"], {
    cwd: folder,
    encoding: "utf8",
  });
  return { code: result.status ?? -1, stderr: result.stderr };
}

async function rows(path: string): Promise<ResultRow[]> {
  const out: ResultRow[] = [];
  for await (const row of readResultsTable(path)) out.push(row);
  return out;
}

const budget = ["--model", "drw", "--seed", "5", "--max-evaluations", "20000"];

describe("horologium batch on multi-band objects", () => {
  it("default: each band on its own, columns <name>.<band>.*, the same numbers as fit on that band", async () => {
    const out = join(folder, "separate.csv");
    expect(batch([...budget, "--out", out]).code).toBe(0);
    const table = await rows(out);
    expect(table).toHaveLength(2);
    for (const row of table) {
      expect(row.status).toBe("ok");
      expect(typeof row["tau.g.median"]).toBe("number");
      expect(typeof row["tau.r.median"]).toBe("number");
      expect(row["diagnostics.converged"]).toBe(true);
    }
    const first = table.find((row) => row.object_id === "lds-q01");
    const fitted = await runInProcess(["fit", join(catalogue, "lds-q01.csv"), "--model", "drw", "--seed", String(first?.seed), "--max-evaluations", "20000", "--quiet"]);
    const json = JSON.parse(fitted.stdout) as { perBand: Record<string, { parameters: Record<string, { median: number }> }> };
    expect(first?.["tau.r.median"]).toBeCloseTo(json.perBand.r?.parameters.tau?.median ?? NaN, 10);
  });

  it("--bands joint: one shared process, columns amplitude.<band>, mean.<band>, the same numbers as fit --bands joint", async () => {
    const out = join(folder, "joint.csv");
    expect(batch([...budget, "--bands", "joint", "--out", out]).code).toBe(0);
    const table = await rows(out);
    expect(table).toHaveLength(2);
    const first = table.find((row) => row.object_id === "lds-q01");
    expect(first?.status).toBe("ok");
    for (const column of ["tau.median", "amplitude.r.median", "mean.g.median", "mean.r.median"]) expect(typeof first?.[column]).toBe("number");
    const fitted = await runInProcess(["fit", join(catalogue, "lds-q01.csv"), "--bands", "joint", "--model", "drw", "--seed", String(first?.seed), "--max-evaluations", "20000", "--quiet"]);
    const json = JSON.parse(fitted.stdout) as { parameters: Record<string, { median: number }> };
    expect(first?.["amplitude.r.median"]).toBeCloseTo(json.parameters["amplitude.r"]?.median ?? NaN, 10);
    expect(first?.["tau.median"]).toBeCloseTo(json.parameters.tau?.median ?? NaN, 10);
  });

  it("--band r: that band only; --lags with --bands separate is a one-line usage error", async () => {
    const out = join(folder, "band-r.csv");
    expect(batch([...budget, "--band", "r", "--out", out]).code).toBe(0);
    const table = await rows(out);
    expect(typeof table[0]?.["tau.median"]).toBe("number");
    expect(table[0]?.["tau.r.median"]).toBeUndefined();
    const wrong = batch([...budget, "--bands", "separate", "--lags", "--out", join(folder, "wrong.csv")]);
    expect(wrong.code).not.toBe(0);
    expect(wrong.stderr.trim().split("\n")).toHaveLength(1);
    expect(wrong.stderr).toContain("--lags");
  });
});
