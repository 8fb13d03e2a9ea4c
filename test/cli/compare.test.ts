import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runInProcess } from "./run-cli-in-process.js";

const QUASAR = join(import.meta.dirname, "../../demo/lds-j0412-2731-quasar.csv");

describe("horologium compare says how strongly the evidence prefers a model", () => {
  it("prints ln Z with its Monte Carlo error, the verdict and ln B on the Kass & Raftery bands, and writes them to the JSON", async () => {
    const { code, stdout, cwd } = await runInProcess(["compare", QUASAR, "--models", "drw,oscillator", "--out", "comparison.json"]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/model\s+ln Z\s+± s\.e\.\s+by\s+delta/);
    // The estimator of each evidence beside its error, in the table and the JSON.
    expect(stdout).toMatch(/^ {2}drw\s+-?[\d.]+\s+0\.\d\d\s+importance\s/m);
    const json = JSON.parse(readFileSync(join(cwd, "comparison.json"), "utf8"));
    for (const standing of json.ranking) {
      expect(["importance", "bridge"]).toContain(standing.evidenceMethod);
      expect(standing.evidenceDetail).toMatch(/^(importance|bridge) sampling: \d+ /);
    }
    const preference = json.preference;
    expect(preference.preferred).toBe(json.ranking[0].label);
    expect(preference.logBayesFactor).toBeCloseTo(json.ranking[0].logEvidence - json.ranking[1].logEvidence, 10);
    expect(preference.standardError).toBeCloseTo(Math.hypot(json.ranking[0].logEvidenceError, json.ranking[1].logEvidenceError), 10);
    expect(["inconclusive", "moderate", "clear", "overwhelming"]).toContain(preference.strength);
    expect(preference.scale).toMatch(/Kass & Raftery 1995/);
    expect(stdout).toContain(`How strongly: ${preference.sentence}`);
    expect(preference.sentence).toMatch(/ln B = [\d.]+ ± [\d.]+, 2 ln B = [\d.]+ ± [\d.]+, (inconclusive|moderate|clear|overwhelming) evidence/);
  });
});
