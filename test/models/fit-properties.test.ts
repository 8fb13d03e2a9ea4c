import { describe, expect, it } from "vitest";
import { tallyFitCases } from "../helpers/fit-property-case.js";

/**
 * Property test of the whole fit (issue 12, item 7) with fast-check: generated cadences (clustered,
 * single season, gapped, repeated and unsorted times, even), N from 3 to 150 here (to 1e5 in
 * test/slow/fit-properties.test.ts), magnitudes and fluxes, errors from 1e-6 to 10, outliers, times
 * near 2.46e6. Every case must end in a result with finite summaries or a one-line InputError or
 * UsageError, never anything else. Fixed seed and a bounded count, so CI is reproducible and quick.
 */
describe("the whole fit on generated light curves", () => {
  it("ends in a finite result or a one-line input/usage error", () => {
    const { counts, failures } = tallyFitCases(150, 15_000, 20261202, 16);
    console.info(`fit properties: ${JSON.stringify(counts)}`);
    expect(failures).toEqual([]);
    expect(counts.result).toBeGreaterThan(0);
  }, 600_000);
});
