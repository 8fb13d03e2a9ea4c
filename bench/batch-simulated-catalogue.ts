/**
 * Simulated quasar catalogues of the invented "Lanternfield" survey, for the batch benchmark and the
 * Slurm integration test: damped-random-walk light curves (Kelly, Bechtold & Siemiginowska 2009;
 * MacLeod et al. 2010) drawn with the project's Gaussian-process engine on a seasonal ground-based
 * cadence, observed with the Ivezic et al. 2019 photometric errors. Invented data, for demos and
 * measurements only.
 *
 * Run as a script: node dist/bench/batch-simulated-catalogue.js --objects 12 --out catalogue.csv
 * writes one CSV table grouped by object (columns object_id, mjd, mag, mag_err).
 */
import { createWriteStream } from "node:fs";
import { pathToFileURL } from "node:url";
import { parseArgs } from "node:util";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import { observeMagnitudes } from "../src/lightcurve/simulated-photometry.js";
import { childSeed, createRng } from "../src/random/rng.js";

/** Options of {@link simulatedQuasars}. */
export interface SimulatedQuasarOptions {
  readonly objects: number;
  readonly seed: number | string;
  /**
   * Observing seasons (default 10): each a 182.6-d window visited every 6 nights with 30% lost to
   * weather, about 21 epochs a season, so ten seasons give about 200 epochs over 9.5 years.
   */
  readonly seasons?: number;
}

/** One simulated quasar: its id, true DRW parameters and observed light curve. */
export interface SimulatedQuasar {
  readonly id: string;
  /** True damping timescale in days (observed frame), log-uniform from 100 d to the baseline. */
  readonly tau: number;
  /** True asymptotic standard deviation in magnitudes, log-uniform in [0.05, 0.25]. */
  readonly sigma: number;
  /** True mean magnitude, uniform in [19, 22]. */
  readonly mean: number;
  readonly lightCurve: LightCurve;
}

/** Single-visit 5-sigma depth of the simulated survey (mag): errors 0.005 mag (floor) at 19 to 0.05 at 22. */
export const SIMULATED_DEPTH = 23.5;

/**
 * Draws quasar light curves one at a time (so a large catalogue never sits in memory). Object k has
 * its own generator seeded with childSeed(seed, k), so any object can be re-created alone.
 *
 * The population: observed-frame damping timescales log-uniform from 100 d up to the baseline and
 * amplitudes sigma = SF_inf / sqrt(2) of 0.05-0.25 mag, the range of MacLeod et al. 2010 (ApJ 721, 1014)
 * for quasars of redshift 0.5-3 (from memory); mean magnitudes 19-22; per-visit errors of Ivezic et al.
 * 2019 eq. 5 at a 5-sigma depth of 23.5 with a 0.005 mag floor (src/lightcurve/photometric-error.ts).
 */
export function* simulatedQuasars(options: SimulatedQuasarOptions): Generator<SimulatedQuasar> {
  for (let k = 0; k < options.objects; k++) {
    const rng = createRng(childSeed(options.seed, k));
    const id = `LQ-${String(k + 1).padStart(5, "0")}`;
    const time = seasonalGroundCadence({ start: 59000, seasons: options.seasons ?? 10, revisitInterval: 6 }, rng);
    const baseline = time[time.length - 1] - time[0];
    const shortest = Math.min(100, baseline / 2);
    const tau = Math.exp(Math.log(shortest) + rng.uniform() * Math.log(baseline / shortest));
    const sigma = Math.exp(Math.log(0.05) + rng.uniform() * Math.log(5));
    const mean = 19 + 3 * rng.uniform();
    const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma, tau }), time, { mean });
    const truth = gp.priorDraw(rng);
    const lightCurve = observeMagnitudes(time, truth, { depth5Sigma: SIMULATED_DEPTH }, rng, `simulated Lanternfield quasar ${id}`);
    yield { id, tau, sigma, mean, lightCurve };
  }
}

/**
 * Writes simulated quasars as one CSV catalogue table grouped by object: object_id, mjd, mag, mag_err
 * (numbers in shortest round-trip form). Returns the number of rows.
 */
export async function writeQuasarCatalogue(path: string, options: SimulatedQuasarOptions): Promise<number> {
  const out = createWriteStream(path);
  let rows = 0;
  const write = (text: string) => (out.write(text) ? Promise.resolve() : new Promise<void>((resolve) => out.once("drain", () => resolve())));
  await write(`# simulated quasars of the invented Lanternfield survey (damped random walks), seed ${options.seed}\n`);
  await write("object_id,mjd,mag,mag_err\n");
  for (const quasar of simulatedQuasars(options)) {
    const { time, value, error } = quasar.lightCurve;
    let block = "";
    for (let i = 0; i < time.length; i++) block += `${quasar.id},${time[i]},${value[i]},${error![i]}\n`;
    rows += time.length;
    await write(block);
  }
  await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
  return rows;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { values } = parseArgs({
    options: {
      objects: { type: "string", default: "12" },
      seed: { type: "string", default: "2026" },
      seasons: { type: "string", default: "10" },
      out: { type: "string" },
    },
  });
  if (!values.out) {
    process.stderr.write("usage: node dist/bench/batch-simulated-catalogue.js --objects N --out catalogue.csv [--seed S] [--seasons K]\n");
    process.exit(2);
  }
  const objects = Number(values.objects);
  const rows = await writeQuasarCatalogue(values.out, { objects, seed: values.seed!, seasons: Number(values.seasons) });
  process.stdout.write(`wrote ${values.out}: ${objects} simulated quasars, ${rows} rows\n`);
}
