import { describe, expect, it } from "vitest";
import { bayesFactorPreference, strengthOfEvidence } from "../../src/models/evidence-scale.js";

// Kass & Raftery 1995 (JASA 90, 773), sec. 3.2: bands of 2 ln B at 2, 6 and 10.
describe("how strongly the evidence prefers a model", () => {
  it("reads 2 ln B on the Kass & Raftery bands", () => {
    expect([0.5, 1.99, 2.01, 5.99, 6.01, 9.99, 10.01, 40].map(strengthOfEvidence)).toEqual([
      "inconclusive",
      "inconclusive",
      "moderate",
      "moderate",
      "clear",
      "clear",
      "overwhelming",
      "overwhelming",
    ]);
  });

  it("orders the two sides, combines their errors and says which words the error reaches", () => {
    const preference = bayesFactorPreference({ label: "b", logEvidence: 10, standardError: 0.3 }, { label: "a", logEvidence: 12.8, standardError: 0.4 });
    expect(preference.preferred).toBe("a");
    expect(preference.over).toBe("b");
    expect(preference.logBayesFactor).toBeCloseTo(2.8, 12);
    expect(preference.standardError).toBeCloseTo(0.5, 12);
    expect(preference.twoLogBayesFactor).toBeCloseTo(5.6, 12);
    expect(preference.strength).toBe("moderate");
    // 5.6 +- 2 x (2 x 0.5) reaches 3.6 to 7.6: moderate to clear.
    expect(preference.strengthRange).toEqual(["moderate", "clear"]);
    expect(preference.sentence).toBe(
      "a over b: ln B = 2.80 ± 0.50, 2 ln B = 5.6 ± 1.0, moderate evidence on the Kass & Raftery 1995 scale; within two standard errors moderate to clear.",
    );
    const laplace = bayesFactorPreference({ label: "a", logEvidence: 20, standardError: null }, { label: "b", logEvidence: 1, standardError: 0.1 });
    expect(laplace.standardError).toBeNull();
    expect(laplace.strengthRange).toEqual(["overwhelming"]);
    expect(laplace.sentence).toMatch(/Laplace, error not estimated/);
  });
});
