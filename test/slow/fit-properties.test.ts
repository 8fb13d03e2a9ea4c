import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fitCases, runCase, type CaseOutcome } from "../helpers/fit-property-case.js";

/**
 * The property test of the whole fit (test/models/fit-properties.test.ts) with more cases and light
 * curves up to 1e5 points (issue 12, item 7): `npm run test:slow`. Fixed seed; prints the tally.
 */
describe("the whole fit on generated light curves (long run)", () => {
  it("ends in a finite result or a one-line input/usage error", () => {
    const tally: Record<CaseOutcome["kind"], number> = { result: 0, "one-line error": 0, failure: 0 };
    const failures: string[] = [];
    fc.assert(
      fc.property(fitCases(100_000), (c) => {
        const outcome = runCase(c, 40_000);
        tally[outcome.kind]++;
        if (outcome.kind === "failure") failures.push(`${JSON.stringify(c)}: ${outcome.message}`);
        return true;
      }),
      { seed: 1202, numRuns: 120 },
    );
    console.info(`fit properties (long run): ${JSON.stringify(tally)}`);
    for (const failure of failures) console.info(failure);
    expect(failures).toEqual([]);
  });
});
