import { describe, expect, it } from "vitest";
import { checkReportInput } from "../../src/report/check-report-input.js";
import { reportFigures } from "../../src/report/report-figures.js";
import { inventedReportInput } from "./invented-input.js";

const input = inventedReportInput({ chains: 3, steps: 30 });

describe("checkReportInput", () => {
  it("accepts a consistent input", () => {
    expect(() => checkReportInput(input)).not.toThrow();
  });
  it("names mismatched prediction and spectrum columns", () => {
    const shortSd = { ...input, prediction: { ...input.prediction, sd: Array.from(input.prediction.sd).slice(1) } };
    expect(() => checkReportInput(shortSd)).toThrow(/prediction\.sd has 399 values, prediction\.time has 400/);
    const badBand = { ...input, psdBand: { ...input.psdBand!, upper: [1, 2] } };
    expect(() => reportFigures(badBand)).toThrow(/psdBand\.upper has 2 values/);
  });
  it("names missing, empty and ragged chains", () => {
    const missing = { ...input, draws: { ...input.draws, names: [...input.draws.names, "quality"] } };
    expect(() => checkReportInput(missing)).toThrow(/no chains for parameter "quality"/);
    const ragged = {
      ...input,
      draws: { ...input.draws, chains: { ...input.draws.chains, sigma: [new Float64Array(30), new Float64Array(29), new Float64Array(30)] } },
    };
    expect(() => checkReportInput(ragged)).toThrow(/draws\.chains\.sigma\[1\] has 29 draws, chain 0 has 30/);
    const fewer = { ...input, draws: { ...input.draws, chains: { ...input.draws.chains, mean: [new Float64Array(30)] } } };
    expect(() => checkReportInput(fewer)).toThrow(/draws\.chains\.mean is 1 chains × 30 draws, but "tau" is 3 × 30/);
    expect(() => checkReportInput({ ...input, draws: { names: [], chains: {} } })).toThrow(/draws\.names is empty/);
  });
});
