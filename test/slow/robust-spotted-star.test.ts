import { describe, expect, it } from "vitest";
import { fitLightCurveDetailed } from "../../src/models/fit-light-curve.js";
import { spottedStarWithOutliers } from "../helpers/spotted-star-outliers.js";

/**
 * The spotted star with five 1.2-4 mag outliers (issue 12; test/helpers/spotted-star-outliers.ts):
 * --robust must flag all five (outlier probability > 0.5) and recover the period of 3.69 d within its 95%
 * interval. Student-t noise as in Lange, Little & Taylor 1989 (JASA 84, 881). Measured 2026-12-02:
 * dominantPeriod 3.691 d [3.672, 3.710], 6 points flagged (the five and one more), about 3 s of CPU.
 */
describe("gross outliers, robust fit", () => {
  it("--robust flags all five and recovers the period within its 95% interval", () => {
    const { lightCurve, bad } = spottedStarWithOutliers();
    const fit = fitLightCurveDetailed(lightCurve, { model: "quasi-periodic", seed: 2, robust: true, clock: () => 0 });
    const probability = fit.robust!.outlierProbability;
    for (const i of bad) expect(probability[i]).toBeGreaterThan(0.5);
    let flagged = 0;
    for (let i = 0; i < probability.length; i++) if (probability[i] > 0.5) flagged++;
    expect(flagged).toBeLessThanOrEqual(bad.length + 4);
    const period = fit.result.derived.dominantPeriod!;
    console.info(`robust spotted star: dominantPeriod ${period.median.toFixed(3)} [${period["q2.5"].toFixed(3)}, ${period["q97.5"].toFixed(3)}], flagged ${flagged}`);
    expect(period["q2.5"]).toBeLessThanOrEqual(3.69);
    expect(period["q97.5"]).toBeGreaterThanOrEqual(3.69);
  });
});
