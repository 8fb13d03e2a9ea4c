/**
 * Writes the built-in demo light curves of `horologium demo` (run once; the CSV files are committed):
 * two invented objects of the invented Lanternfield Deep Survey, simulated with Horologium itself.
 *
 *   npx tsx scripts/make-demo-data.ts
 */
import { writeFileSync } from "node:fs";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import { formatLightCurveCsv } from "../src/lightcurve/light-curve-csv.js";
import { observeMagnitudes } from "../src/lightcurve/simulated-photometry.js";
import { createRng } from "../src/random/rng.js";

const quasarRng = createRng("lanternfield-quasar");
const quasarTimes = seasonalGroundCadence({ start: 58850, seasons: 8, revisitInterval: 4 }, quasarRng);
const quasarTruth = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.22, tau: 180 }), quasarTimes, { mean: 20.1 }).priorDraw(quasarRng);
const quasar = observeMagnitudes(quasarTimes, quasarTruth, { depth5Sigma: 23.4 }, quasarRng, "LDS J0412-2731");
writeFileSync(
  "demo/lds-j0412-2731-quasar.csv",
  formatLightCurveCsv(quasar, {
    comments: [
      "Lanternfield Deep Survey (an invented survey): quasar LDS J0412-2731 (invented), redshift 1.62, r band",
      "simulated: damped random walk sigma = 0.22 mag, tau = 180 d (observed frame); 5-sigma depth 23.4",
    ],
  }),
);

const starRng = createRng("lanternfield-star");
const starTimes = seasonalGroundCadence({ start: 59200, seasons: 3, revisitInterval: 1 }, starRng);
const starKernel = kernels.quasiPeriodic({ sigma: 0.03, period: 7.43, decayTime: 28, harmonicWeight: 0.35 });
const starTruth = new GaussianProcess(starKernel, starTimes, { mean: 15.2 }).priorDraw(starRng);
const star = observeMagnitudes(starTimes, starTruth, { depth5Sigma: 22.5 }, starRng, "LDS V-2291");
writeFileSync(
  "demo/lds-v2291-spotted-star.csv",
  formatLightCurveCsv(star, {
    comments: [
      "Lanternfield Deep Survey (an invented survey): spotted star LDS V-2291 (invented), r band",
      "simulated: quasi-periodic rotation, period 7.43 d, decay time 28 d, harmonic weight 0.35, sigma 0.03 mag",
    ],
  }),
);
console.log(`quasar: ${quasarTimes.length} points; star: ${starTimes.length} points`);
