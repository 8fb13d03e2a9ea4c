import { describe, expect, it } from "vitest";
import { roundedGeometry } from "../../src/report/render-svg.js";

describe("roundedGeometry: the SVG's pixel positions to 1/100 px", () => {
  it("rounds the numbers of d, transform and points, and leaves text and other attributes alone", () => {
    const svg =
      '<svg width="760.123456"><path transform="translate(44.600028239690026,170.6815863692226)" d="M1.225,0A1.2254,1.2254,0,1,1,-1.22549,0L3e-7,2.5e-12"/>' +
      '<polyline points="0.123456,9.87654"/><text x="12.34567">P = 7.43421 d</text></svg>';
    expect(roundedGeometry(svg)).toBe(
      '<svg width="760.123456"><path transform="translate(44.6,170.68)" d="M1.23,0A1.23,1.23,0,1,1,-1.23,0L3e-7,2.5e-12"/>' +
        '<polyline points="0.12,9.88"/><text x="12.34567">P = 7.43421 d</text></svg>',
    );
  });
});
