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
  /** Observing seasons; 6 seasons of the default cadence give about 250 points per light curve. */
  readonly seasons?: number;
}

/** One simulated quasar: its id, true DRW parameters and observed light curve. */
export interface SimulatedQuasar {
  readonly id: string;
  /** True damping timescale in days, log-uniform in [50, 500]. */
  readonly tau: number;
  /** True asymptotic standard deviation in magnitudes, uniform in [0.1, 0.3]. */
  readonly sigma: number;
  /** True mean magnitude, uniform in [18, 21]. */
  readonly mean: number;
  readonly lightCurve: LightCurve;
}

/**
 * Draws quasar light curves one at a time (so a large catalogue never sits in memory). Object k has
 * its own generator seeded with childSeed(seed, k), so any object can be re-created alone.
 */
export function* simulatedQuasars(options: SimulatedQuasarOptions): Generator<SimulatedQuasar> {
  for (let k = 0; k < options.objects; k++) {
    const rng = createRng(childSeed(options.seed, k));
    const id = `LQ-${String(k + 1).padStart(5, "0")}`;
    const tau = Math.exp(Math.log(50) + rng.uniform() * Math.log(10));
    const sigma = 0.1 + 0.2 * rng.uniform();
    const mean = 18 + 3 * rng.uniform();
    const time = seasonalGroundCadence({ start: 59000, seasons: options.seasons ?? 6 }, rng);
    const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma, tau }), time, { mean });
    const truth = gp.priorDraw(rng);
    const lightCurve = observeMagnitudes(time, truth, { depth5Sigma: 24 }, rng, `simulated Lanternfield quasar ${id}`);
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
      seasons: { type: "string", default: "6" },
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
