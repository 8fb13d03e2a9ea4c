import { describe, expect, it } from "vitest";
import { tallyFitCases } from "../helpers/fit-property-case.js";

/**
 * The property test of the whole fit (test/models/fit-properties.test.ts) with more cases and light
 * curves up to 1e5 points (issue 12, item 7): `npm run test:slow`. Fixed seed; prints the tally.
 */
describe("the whole fit on generated light curves (long run)", () => {
  it("ends in a finite result or a one-line input/usage error", () => {
    const { counts, failures } = tallyFitCases(100_000, 40_000, 1202, 120);
    console.info(`fit properties (long run): ${JSON.stringify(counts)}`);
    for (const failure of failures) console.info(failure);
    expect(failures).toEqual([]);
  });
});
