/**
 * Writes the built-in demo light curves of `horologium demo` (run once; the CSV files are committed):
 * three invented objects of the invented Lanternfield Deep Survey, simulated with Horologium itself.
 *
 *   npx tsx scripts/make-demo-data.ts
 */
import { writeFileSync } from "node:fs";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import { formatLightCurveCsv } from "../src/lightcurve/light-curve-csv.js";
import { observeMagnitudes } from "../src/lightcurve/simulated-photometry.js";
import { simulateInterleavedBands } from "../src/models/simulated-bands.js";
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
// Six filters visited in turn, one per night; the continuum at longer wavelengths follows the shorter
// ones by days (lags relative to g), and the variability amplitude falls with wavelength.
const bandsRng = createRng("lanternfield-six-band-quasar");
const visits = seasonalGroundCadence({ start: 59000, seasons: 4, revisitInterval: 1.5 }, bandsRng);
const sixBands = simulateInterleavedBands(
  kernels.dampedRandomWalk({ sigma: 0.2, tau: 140 }),
  visits,
  [
    { name: "u", amplitude: 1.25, mean: 20.9, lag: -1.5, depth5Sigma: 23.3 },
    { name: "g", amplitude: 1, mean: 20.5, lag: 0, depth5Sigma: 24.3 },
    { name: "r", amplitude: 0.85, mean: 20.3, lag: 1.6, depth5Sigma: 24.1 },
    { name: "i", amplitude: 0.75, mean: 20.1, lag: 3, depth5Sigma: 23.6 },
    { name: "z", amplitude: 0.65, mean: 20.0, lag: 4.2, depth5Sigma: 22.9 },
    { name: "y", amplitude: 0.6, mean: 19.9, lag: 5.2, depth5Sigma: 22.0 },
  ],
  bandsRng,
  "LDS J2207+0134",
);
writeFileSync(
  "demo/lds-j2207-0134-six-band-quasar.csv",
  formatLightCurveCsv(sixBands, {
    comments: [
      "Lanternfield Deep Survey (an invented survey): quasar LDS J2207+0134 (invented), redshift 0.74, bands u g r i z y",
      "simulated: one damped random walk, sigma = 0.2 mag in g, tau = 140 d; amplitudes relative to g 1.25 1 0.85 0.75 0.65 0.6;",
      "lags relative to g -1.5 0 1.6 3.0 4.2 5.2 d; one filter per visit, in turn",
    ],
  }),
);
console.log(`quasar: ${quasarTimes.length} points; star: ${starTimes.length} points; six-band quasar: ${visits.length} visits`);
