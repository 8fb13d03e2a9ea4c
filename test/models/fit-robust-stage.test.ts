import { describe, expect, it } from "vitest";
import { summarizeLightCurve } from "../../src/models/data-summary.js";
import { periodogramPeriod } from "../../src/models/fit-period-search.js";
import { periodSearchCurve } from "../../src/models/fit-robust-stage.js";
import { modelPeriodRange } from "../../src/models/period-range.js";
import { spottedStarWithOutliers } from "../helpers/spotted-star-outliers.js";

describe("the robust fit's period search", () => {
  it("finds the spotted star's 3.69 d period under five 1.2-4 mag outliers, which move the plain periodogram peak", () => {
    // Invented data (test/helpers/spotted-star-outliers.ts): the generalised Lomb-Scargle peak of the
    // raw values is pulled off the period by the outliers; with each error divided by the square root
    // of its Student-t weight about the running median, the peak is the spot period again.
    const { lightCurve } = spottedStarWithOutliers();
    const range = modelPeriodRange("quasi-periodic", summarizeLightCurve(lightCurve), {}, "spotted star");
    if (range === undefined) throw new Error("a periodic model has a period range");
    const plain = periodogramPeriod(periodSearchCurve(lightCurve, false), range);
    const robust = periodogramPeriod(periodSearchCurve(lightCurve, true), range);
    expect(Math.abs((plain ?? 0) / 3.69 - 1)).toBeGreaterThan(0.05);
    expect(Math.abs((robust ?? 0) / 3.69 - 1)).toBeLessThan(0.01);
  });
});
