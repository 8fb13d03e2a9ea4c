/**
 * CARMA order choice by evidence (issue 14): light curves simulated from a CARMA(2,1) process (a damped
 * oscillation of period 60 d and quality 0.8 with moving-average coefficient 8 d; Kelly et al. 2014,
 * ApJ 788, 33) on five seasons of a ground-based cadence are compared over the CARMA grid (p <= 4, q < p)
 * by Laplace evidence (`compareModels`). Prints, per light curve, the preferred order, 2 ln B over the
 * runner-up and the maximum a posteriori of the CARMA(2,1) fit against the truth; then how often the
 * simulated order won. Slow (ten optimisations per light curve); nothing is asserted.
 *
 *   npx tsx bench/carma-order-choice.ts [--curves K]
 */
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { compareModels } from "../src/models/compare-models.js";
import { createRng } from "../src/random/rng.js";
import { formatSignificant, markdownTable } from "./engine-timing.js";

const TRUTH = { sigma: 0.25, period: 60, quality: 0.8, ma1: 8 };

function argument(name: string, fallback: number): number {
  const index = process.argv.indexOf(`--${name}`);
  return index >= 0 ? Number(process.argv[index + 1]) : fallback;
}

function simulated(k: number): LightCurve {
  const rng = createRng(`bench:carma-order:${k}`);
  const time = seasonalGroundCadence({ seasons: 5, revisitInterval: 2 }, rng);
  const kernel = kernels.carma({ sigma: TRUTH.sigma, oscillations: [{ period: TRUTH.period, quality: TRUTH.quality }], movingAverage: [TRUTH.ma1] });
  const latent = new GaussianProcess(kernel, time).priorDraw(rng);
  const error = Float64Array.from(time, () => 0.02);
  return {
    time,
    value: Float64Array.from(latent, (v, i) => 19 + v + error[i] * rng.normal()),
    error,
    unit: "mag",
    provenance: { source: `carma-${k}`, timeColumn: "t", valueColumn: "mag", errorColumn: "err", dropped: 0, sorted: false },
  };
}

function main(): void {
  const curves = argument("curves", 20);
  const rows: string[][] = [];
  let wins = 0;
  for (let k = 0; k < curves; k++) {
    const comparison = compareModels(simulated(k), ["carma"], { seed: k + 1 });
    const [best, second] = comparison.ranking;
    if (best.order === "2,1") wins++;
    const fitted = comparison.ranking.find((s) => s.order === "2,1")!.maximum;
    rows.push([
      String(k),
      best.label,
      formatSignificant(2 * (best.logEvidence - second.logEvidence)),
      formatSignificant(fitted.period0),
      formatSignificant(fitted.quality0),
      formatSignificant(fitted.ma1),
      formatSignificant(fitted.sigma),
    ]);
  }
  console.log(markdownTable(["curve", "preferred order", "2 ln B over runner-up", "period0 (60)", "quality0 (0.8)", "ma1 (8)", "sigma (0.25)"], rows));
  console.log(`\nthe simulated order CARMA(2,1) won ${wins} of ${curves}`);
}

main();
