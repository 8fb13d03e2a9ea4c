import { describe, expect, it } from "vitest";
import { InputError } from "../../src/errors/input-error.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import { RESULT_FORMAT_VERSION } from "../../src/models/fit-result.js";
import { parseFitResult } from "../../src/models/parse-fit-result.js";
import { createRng } from "../../src/random/rng.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { inventedFitResult } from "../helpers/invented-fit-result.js";

/** What a result file holds after writing: JSON turns NaN and infinities into null. */
function throughJson(value: unknown): unknown {
  return JSON.parse(JSON.stringify(value));
}

/** The one-line message parseFitResult gives for `value`, or "" if it reads the value. */
function problemOf(value: unknown): string {
  try {
    parseFitResult(value, "lds.json");
    return "";
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    const message = (error as Error).message;
    expect(message.split("\n")).toHaveLength(1);
    return message;
  }
}

/** A damped random walk observed at irregular times (AR(1) form of the DRW; Kelly et al. 2009, ApJ 698, 895). */
function inventedLightCurve(n: number, seed: number): LightCurve {
  const rng = createRng(seed);
  const time = new Float64Array(n);
  const value = new Float64Array(n);
  let x = 0;
  for (let i = 0; i < n; i++) {
    time[i] = i === 0 ? 0 : time[i - 1] + 2 + 8 * rng.uniform();
    const a = i === 0 ? 0 : Math.exp(-(time[i] - time[i - 1]) / 40);
    x = a * x + 0.2 * Math.sqrt(1 - a * a) * rng.normal();
    value[i] = 19 + x + 0.03 * rng.normal();
  }
  return {
    time,
    value,
    error: new Float64Array(n).fill(0.03),
    unit: "mag",
    provenance: { source: "lds-invented.csv", timeColumn: "mjd", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: true },
  };
}

describe("parseFitResult: reading a fit-result file back", () => {
  it("reads back exactly what a fit wrote, and every key the fit writes is one it declares", () => {
    // A short, unconverged fit is enough: the format does not depend on convergence.
    // Importance sampling (drw: importanceWeights), the ensemble and NUTS (chainTraces).
    for (const options of [{ model: "drw" as const, robust: true, redshift: 1.2 }, { model: "oscillator" as const }, { model: "drw" as const, sampler: "nuts" as const, maxEvaluations: 2e5 }]) {
      const result = fitLightCurve(inventedLightCurve(60, 3), { seed: 5, maxEvaluations: 3e4, keptDraws: 40, ...options });
      const written = throughJson(result);
      // Keys the reader does not know would be dropped here, and the comparison would fail.
      expect(throughJson(parseFitResult(written, "lds.json"))).toEqual(written);
      expect(result.formatVersion).toBe(RESULT_FORMAT_VERSION);
      expect(result.chainTraces !== undefined || result.importanceWeights !== undefined).toBe(true);
    }
  });

  it("turns the nulls JSON writes for NaN and infinities back into NaN", () => {
    const result = inventedFitResult({ diagnostics: { ...inventedFitResult().diagnostics, rhatMax: Infinity, autocorrelationTime: NaN } });
    const read = parseFitResult(throughJson(result), "lds.json");
    expect(read.diagnostics.rhatMax).toBeNaN();
    expect(read.diagnostics.autocorrelationTime).toBeNaN();
    expect(read.diagnostics.essMin).toBe(812);
  });

  it("says when a file was written by an older or a newer format", () => {
    const { formatVersion: _, ...withoutVersion } = inventedFitResult();
    expect(problemOf(withoutVersion)).toMatch(/^lds\.json: written by an older version of horologium \(a result file without "formatVersion"; this version reads format 3\)/);
    expect(problemOf({ ...inventedFitResult(), formatVersion: 1 })).toMatch(/^lds\.json: written in the older result format 1 \(this version reads format 3\)/);
    expect(problemOf({ ...inventedFitResult(), formatVersion: 4 })).toMatch(/^lds\.json: written in result format 4, which this version of horologium \(format 3\) does not know/);
  });

  it("names the file and the field of a malformed result", () => {
    const good = inventedFitResult();
    expect(problemOf([1, 2])).toBe('lds.json: not a horologium fit result (no "formatVersion" or "parameters")');
    expect(problemOf({ ...good, diagnostics: { ...good.diagnostics, rhatMax: "high" } })).toBe(
      'lds.json: field "diagnostics.rhatMax" must be a number, got "high"',
    );
    const { n: _, ...withoutN } = good.data;
    expect(problemOf({ ...good, data: withoutN })).toBe('lds.json: field "data.n" must be a non-negative integer, got nothing (the field is missing)');
    expect(problemOf({ ...good, model: "sine" })).toBe('lds.json: field "model" must be one of drw, oscillator, quasi-periodic, carma, got "sine"');
    expect(problemOf({ ...good, parameters: { ...good.parameters, tau: { ...good.parameters.tau, hdi95: [1, 2, 3] } } })).toBe(
      'lds.json: field "parameters.tau.hdi95" must be two numbers [lower, upper], got [1,2,3]',
    );
    const rows = [...good.posteriorSample.rows];
    rows[1] = [215, 0.21];
    expect(problemOf({ ...good, posteriorSample: { ...good.posteriorSample, rows } })).toBe(
      'lds.json: field "posteriorSample.rows[1]" must be 3 numbers (one per name), got [215,0.21]',
    );
    expect(problemOf({ ...good, warnings: ["fine", 7] })).toBe('lds.json: field "warnings[1]" must be a string, got 7');
    expect(problemOf({ ...good, diagnostics: { ...good.diagnostics, sampler: "gibbs" } })).toBe(
      'lds.json: field "diagnostics.sampler" must be "nuts" or "ensemble", got "gibbs"',
    );
  });

  it("labels the result of a multi-result file", () => {
    expect(() => parseFitResult({ ...inventedFitResult(), seed: null }, "bands.json", "result 2")).toThrow(
      'bands.json: result 2: field "seed" must be a number or a string, got null',
    );
  });
});
