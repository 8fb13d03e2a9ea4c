import { describe, expect, it } from "vitest";
import { nearestOption } from "../../src/cli/nearest-option.js";
import { parseVerbArguments } from "../../src/cli/verb-arguments.js";

describe("a mistyped option", () => {
  const known = ["redshift", "robust", "seed", "model", "max-evaluations", "background"];
  it("finds the nearest known option within two edits (swaps count once: Damerau 1964)", () => {
    expect(nearestOption("redshfit", known)).toBe("redshift");
    expect(nearestOption("modle", known)).toBe("model");
    expect(nearestOption("max-evaluation", known)).toBe("max-evaluations");
    expect(nearestOption("backround", known)).toBe("background");
    expect(nearestOption("zzz", known)).toBeUndefined();
    expect(nearestOption("sd", known)).toBeUndefined();
  });
  it("is answered with the nearest option by every verb's parser", () => {
    const options = { redshift: { type: "string" }, robust: { type: "boolean" } } as const;
    expect(() => parseVerbArguments(["--redshfit", "1.6"], options, "", () => {})).toThrow(
      "unknown option --redshfit: did you mean --redshift? (see --help)",
    );
    expect(() => parseVerbArguments(["--zzz"], options, "", () => {})).toThrow("unknown option --zzz (see --help for the options)");
  });
});
