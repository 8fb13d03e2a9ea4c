import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fitCases, runCase, type CaseOutcome } from "../helpers/fit-property-case.js";

/**
 * Property test of the whole fit (issue 12, item 7) with fast-check: generated cadences (clustered,
 * single season, gapped, repeated and unsorted times, even), N from 3 to 150 here (to 1e5 in
 * test/slow/fit-properties.test.ts), magnitudes and fluxes, errors from 1e-6 to 10, outliers, times
 * near 2.46e6. Every case must end in a result with finite summaries or a one-line InputError or
 * UsageError, never anything else. Fixed seed and a bounded count, so CI is reproducible and quick.
 */
describe("the whole fit on generated light curves", () => {
  it("ends in a finite result or a one-line input/usage error", () => {
    const tally: Record<CaseOutcome["kind"], number> = { result: 0, "one-line error": 0, failure: 0 };
    const failures: string[] = [];
    fc.assert(
      fc.property(fitCases(150), (c) => {
        const outcome = runCase(c, 15_000);
        tally[outcome.kind]++;
        if (outcome.kind === "failure") failures.push(`${JSON.stringify(c)}: ${outcome.message}`);
        return outcome.kind !== "failure";
      }),
      { seed: 20261202, numRuns: 16, endOnFailure: true },
    );
    console.info(`fit properties: ${JSON.stringify(tally)}`);
    expect(failures).toEqual([]);
  }, 600_000);
});
