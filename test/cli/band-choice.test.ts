import { describe, expect, it } from "vitest";
import { bandChoice, catalogueBandRule } from "../../src/cli/band-choice.js";
import type { LightCurve } from "../../src/lightcurve/light-curve.js";

const band = (name: string): LightCurve => ({
  time: Float64Array.of(0, 1),
  value: Float64Array.of(0, 0),
  unit: "mag",
  band: name,
  provenance: { source: "test", timeColumn: "time", valueColumn: "mag", errorColumn: null, dropped: 0, sorted: false },
});

// The one rule every verb follows for the bands of its input (docs/architecture.md, "Several bands").
describe("the band rule", () => {
  const three = [band("g"), band("r"), band("i")];

  it("fits one band alone, several bands each on its own by default, jointly when asked or implied", () => {
    expect(bandChoice({}, [band("g")])).toEqual({ kind: "single" });
    expect(bandChoice({}, three)).toEqual({ kind: "separate" });
    expect(bandChoice({ bands: "joint" }, three)).toEqual({ kind: "joint", lags: false });
    expect(bandChoice({ lags: true, "reference-band": "r" }, three)).toEqual({ kind: "joint", lags: true, referenceBand: "r" });
  });

  it("refuses options that do not apply, in one line naming them", () => {
    expect(() => bandChoice({ lags: true }, [band("g")])).toThrow(/--lags needs the joint model of several bands \(the input has one band\)/);
    expect(() => bandChoice({ "reference-band": "u" }, three)).toThrow(/--reference-band u: no such band \(bands: g, r, i\)/);
    expect(() => bandChoice({ bands: "both" }, three)).toThrow(/--bands must be joint or separate/);
    // Robust noise is a model of one band's points; the joint model has none.
    expect(() => bandChoice({ bands: "joint", robust: true }, three)).toThrow(/--robust fits one band at a time/);
    expect(() => bandChoice({ lags: true, robust: true }, three)).toThrow(/--robust fits one band at a time/);
    expect(bandChoice({ robust: true }, three)).toEqual({ kind: "separate" });
    expect(bandChoice({ bands: "joint", robust: true }, [band("g")])).toEqual({ kind: "single" });
  });

  it("checks a catalogue's band options before any object is read", () => {
    expect(catalogueBandRule({ bands: "joint", lags: true })).toEqual({ bands: "joint", lags: true });
    expect(() => catalogueBandRule({ bands: "separate", lags: true })).toThrow(/--lags needs the joint model/);
    expect(() => catalogueBandRule({ bands: "joint", robust: true })).toThrow(/--robust fits one band at a time/);
    expect(catalogueBandRule({ robust: true })).toEqual({});
  });
});
