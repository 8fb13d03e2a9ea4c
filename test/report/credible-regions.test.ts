import { describe, expect, it } from "vitest";
import { credibleRegions } from "../../src/report/credible-regions.js";
import { createRng } from "../../src/random/rng.js";

describe("credibleRegions", () => {
  it("finds the discs of two independent standard normals", () => {
    // For two independent standard normals r^2 is chi-square with 2 degrees of freedom, P(r < R) = 1 - exp(-R^2 / 2),
    // so the highest-density region of mass m is the disc of radius sqrt(-2 ln(1 - m)) (common practice).
    const rng = createRng(5);
    const n = 40000;
    const xs = Float64Array.from({ length: n }, () => rng.normal());
    const ys = Float64Array.from({ length: n }, () => rng.normal());
    const bins = 40;
    const grid = credibleRegions(xs, ys, [-4, 4], [-4, 4], bins, [0.68, 0.95]);
    for (const [mass, radius] of [
      [0.68, Math.sqrt(-2 * Math.log(0.32))],
      [0.95, Math.sqrt(-2 * Math.log(0.05))],
    ] as const) {
      let inside = 0;
      let area = 0;
      for (let r = 0; r < bins; r++) {
        for (let c = 0; c < bins; c++) {
          const level = grid.level[r * bins + c];
          if (!(level <= mass)) continue;
          area += 0.04;
          const x = 0.5 * (grid.xEdges[c] + grid.xEdges[c + 1]);
          const y = 0.5 * (grid.yEdges[r] + grid.yEdges[r + 1]);
          if (Math.hypot(x, y) < radius + 0.3) inside++;
        }
      }
      // Every cell of the region lies in the disc (within smoothing and cell size), and the areas agree to 10%.
      expect(inside / (area / 0.04)).toBeGreaterThan(0.99);
      expect(area / (Math.PI * radius * radius)).toBeGreaterThan(0.9);
      expect(area / (Math.PI * radius * radius)).toBeLessThan(1.15);
    }
  });
});
