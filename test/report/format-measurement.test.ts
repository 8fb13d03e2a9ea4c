import { describe, expect, it } from "vitest";
import { formatAtDigit, formatMeasurement, formatSignificant, lastDigitPower } from "../../src/report/format-measurement.js";

describe("lastDigitPower (Particle Data Group rounding rule)", () => {
  // Particle Data Group, Review of Particle Physics, Introduction, "Rounding": leading three digits of the
  // error 100-354 -> two significant digits, 355-949 -> one, 950-999 -> round up to 1000, two digits (from memory).
  it("keeps two digits for leading digits 100 to 354", () => {
    expect(lastDigitPower(0.119)).toBe(-2);
    expect(lastDigitPower(0.354)).toBe(-2);
    expect(lastDigitPower(35.4)).toBe(0);
  });
  it("keeps one digit for leading digits 355 to 949", () => {
    expect(lastDigitPower(0.355)).toBe(-1);
    expect(lastDigitPower(0.367)).toBe(-1);
    expect(lastDigitPower(61.7)).toBe(1);
  });
  it("rounds 950 to 999 up to 1000 with two digits", () => {
    expect(lastDigitPower(0.0987)).toBe(-2); // 0.0987 -> 0.10
    expect(lastDigitPower(9.96)).toBe(0); // 9.96 -> 10
  });
});

describe("formatMeasurement", () => {
  it("reproduces the rounding examples of the Particle Data Group", () => {
    // PDG Introduction, "Rounding": 0.827 +- 0.119 -> 0.83 +- 0.12 and 0.827 +- 0.367 -> 0.8 +- 0.4 (from memory).
    expect(formatMeasurement(0.827, 0.119, 0.119)).toBe("0.83 ± 0.12");
    expect(formatMeasurement(0.827, 0.367, 0.367)).toBe("0.8 ± 0.4");
  });
  it("rounds asymmetric errors by the smaller one and writes a typographic minus", () => {
    expect(formatMeasurement(312.4, 61.7, 79.2)).toBe("310 +80/−60");
    expect(formatMeasurement(-1.2345, 0.0987, 0.2)).toBe("−1.23 +0.20/−0.10");
  });
  it("uses a shared power of ten for very small or very large values", () => {
    expect(formatMeasurement(3.2e-16, 4e-17, 4e-17)).toBe("(3.2 ± 0.4) × 10⁻¹⁶");
    // An error of 0.30 (leading digits 300) keeps two digits under the same rule.
    expect(formatMeasurement(2.5e7, 3e6, 4e6)).toBe("(2.50 +0.40/−0.30) × 10⁷");
  });
  it("falls back to three significant digits without a usable error", () => {
    expect(formatMeasurement(123.456, 0, 0)).toBe("123");
    expect(formatMeasurement(Number.NaN, 1, 1)).toBe("NaN");
  });
});

describe("formatAtDigit and formatSignificant", () => {
  it("rounds to the given digit", () => {
    expect(formatAtDigit(466.04, 1)).toBe("470");
    expect(formatAtDigit(-0.19186, -3)).toBe("−0.192");
    expect(formatAtDigit(-0.0001, -2)).toBe("0.00");
  });
  it("keeps significant digits and switches to exponents only at extremes", () => {
    expect(formatSignificant(1234.567, 3)).toBe("1230");
    expect(formatSignificant(0.0123456, 2)).toBe("0.012");
    expect(formatSignificant(-2.5e-5, 2)).toBe("−2.5e-5");
    expect(formatSignificant(3.0e8, 3)).toBe("3e8");
  });
});
