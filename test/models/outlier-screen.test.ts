import { describe, expect, it } from "vitest";
import { grossOutliers, grossOutlierThreshold } from "../../src/models/outlier-screen.js";
import { normalQuantile } from "../../src/inference/distribution-functions.js";
import { spottedStarWithOutliers } from "../helpers/spotted-star-outliers.js";

/**
 * The outlier screen (issue 12) on the spotted star with five points moved by 1.2-4 mag
 * (test/helpers/spotted-star-outliers.ts; the robust fit of it is test/slow/robust-spotted-star.test.ts).
 */
describe("gross outliers", () => {
  it("the screen about a running median finds all five and nothing else", () => {
    const { lightCurve, bad } = spottedStarWithOutliers();
    expect(grossOutliers(lightCurve)).toEqual(bad);
  });

  it("the threshold is the |z| that N Gaussian points exceed with 1% probability (@stdlib normal quantile), at least 5", () => {
    expect(grossOutlierThreshold(400)).toBe(5);
    expect(grossOutlierThreshold(1e6)).toBeCloseTo(normalQuantile(1 - 0.005 / 1e6, 0, 1), 12);
    expect(grossOutlierThreshold(1e6)).toBeGreaterThan(5.7);
  });
});
