/**
 * Does the NUTS warm-up ({@link planWarmup}, the mass-matrix updates of nuts-sampler.ts) adapt as well as
 * knowing the answer would? For each target NUTS runs three ways from the same starts and seeds, 4 chains,
 * 500 warm-up and 1000 kept iterations each:
 * - "schedule": the default warm-up from the mass matrix a fit would start with (the curvature at the mode
 *   for the light-curve models; all ones for the ill-scaled Gaussian, to see whether it recovers the scales);
 * - "oracle": no mass-matrix window, the inverse mass fixed at the posterior variances (exact for the
 *   Gaussian; from a long pilot run of 4 x 5000 kept draws for the light-curve models), step size adapted;
 * - "start kept": the starting mass matrix kept (the curvature at the mode, or all ones), step size adapted.
 * Printed per target and way, over the seeds: the mean final step size, the mean worst ratio of adapted
 * inverse mass to posterior variance (max over chains and parameters of |ln ratio|, in e-folds), leapfrog
 * steps per iteration (warm-up included), the mean smallest bulk ESS over parameters, and gradient
 * evaluations (warm-up included) per effective sample as total gradients over total smallest ESS, with the
 * per-seed range beside it. These are counts, not times: the machine's load does not change them.
 *
 * Run: nice -n 19 npx tsx bench/nuts-warmup-compare.ts [seeds=5] [targets=gauss,drw,qp] [ways=schedule,oracle,kept] [first seed=1]
 * The pilot variances are cached in the system's temporary directory (they depend only on fixed seeds).
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { bulkEffectiveSampleSize } from "../src/inference/effective-sample-size.js";
import type { PosteriorTarget } from "../src/inference/posterior-target.js";
import { findMaximumPosterior } from "../src/inference/maximum-posterior.js";
import { modeScales } from "../src/inference/mode-curvature.js";
import { createNutsSampler } from "../src/inference/nuts-sampler.js";
import { unconstrainedPosterior } from "../src/inference/unconstrained-posterior.js";
import { createRng } from "../src/random/rng.js";
import { dampedRandomWalkFit, quasiPeriodicFit, type SimulatedFit } from "./samplers-gp-models.js";

const WARMUP = 500;
const KEPT = 1000;
const CHAINS = 4;
const PILOT_KEPT = 5000;

type Way = "schedule" | "oracle" | "kept";
const WAY_LABELS: Record<Way, string> = { schedule: "schedule", oracle: "oracle", kept: "start kept" };

interface Target {
  readonly key: string;
  readonly label: string;
  readonly density: PosteriorTarget;
  /** Where the chains start, before a small jitter. */
  readonly centre: Float64Array;
  /** The inverse mass a fit would start from. */
  readonly startInverseMass: Float64Array;
  /** Posterior variance of each coordinate. */
  readonly variance: Float64Array;
}

/** A Gaussian with independent coordinates whose scales span six decades (variances known exactly). */
function scaledGaussian(): Target {
  const sd = Float64Array.of(1e-3, 1, 30, 1e3);
  return {
    key: "gauss",
    label: "Gaussian, sd 1e-3..1e3, from unit mass",
    density: {
      dimension: sd.length,
      logPosterior: (x) => x.reduce((a, v, i) => a - (0.5 * v * v) / (sd[i] * sd[i]), 0),
      logPosteriorAndGradient: (x, g) => {
        let lp = 0;
        for (let i = 0; i < x.length; i++) {
          g[i] = -x[i] / (sd[i] * sd[i]);
          lp -= (0.5 * x[i] * x[i]) / (sd[i] * sd[i]);
        }
        return lp;
      },
    },
    centre: new Float64Array(sd.length),
    startInverseMass: new Float64Array(sd.length).fill(1),
    variance: Float64Array.from(sd, (s) => s * s),
  };
}

interface RunFigures {
  readonly stepSize: number;
  readonly massError: number;
  readonly stepsPerIteration: number;
  readonly essMin: number;
  readonly gradients: number;
  readonly warmupShare: number;
  readonly restarts: number;
  readonly draws: Float64Array[][];
}

function runNuts(target: Target, seed: number, way: Way, kept = KEPT): RunFigures {
  const rng = createRng(seed);
  const initial = Array.from({ length: CHAINS }, () =>
    Float64Array.from(target.centre, (c, i) => c + 0.1 * Math.sqrt(target.startInverseMass[i]) * rng.normal()),
  );
  const sampler = createNutsSampler(target.density, initial, `warmup-bench-${seed}`, {
    warmup: WARMUP,
    initialInverseMass: way === "oracle" ? target.variance : target.startInverseMass,
    ...(way === "schedule" ? {} : { warmupPlan: { windowStarts: [], windowEnds: [] } }),
  });
  for (let i = 0; i < WARMUP + kept; i++) sampler.iterate();
  const details = sampler.details() as {
    stepSizes: number[];
    inverseMassDiagonals: number[][];
    leapfrogSteps: number;
    warmupLeapfrogSteps: number;
    stepSizeRestarts: number;
  };
  const dimension = target.density.dimension;
  const draws = Array.from({ length: dimension }, (_, j) => sampler.draws.coordinate(j));
  const essMin = draws.reduce((least, chains) => Math.min(least, bulkEffectiveSampleSize(chains)), Infinity);
  let massError = 0;
  for (const diagonal of details.inverseMassDiagonals) {
    diagonal.forEach((m, j) => (massError = Math.max(massError, Math.abs(Math.log(m / target.variance[j])))));
  }
  return {
    stepSize: details.stepSizes.reduce((a, b) => a + b, 0) / details.stepSizes.length,
    massError,
    stepsPerIteration: details.leapfrogSteps / (CHAINS * (WARMUP + kept)),
    essMin,
    gradients: details.leapfrogSteps,
    warmupShare: details.warmupLeapfrogSteps / details.leapfrogSteps,
    restarts: details.stepSizeRestarts,
    draws,
  };
}

/** Sample variance of each coordinate over all chains' draws. */
function drawVariances(draws: readonly Float64Array[][]): Float64Array {
  return Float64Array.from(draws, (chains) => {
    let n = 0;
    let mean = 0;
    let m2 = 0;
    for (const chain of chains) {
      for (const v of chain) {
        n++;
        const delta = v - mean;
        mean += delta / n;
        m2 += delta * (v - mean);
      }
    }
    return m2 / (n - 1);
  });
}

/**
 * A light-curve fit as a target: started at the mode of the unconstrained density (with the Jacobian) with
 * the curvature there as the starting inverse mass, as `samplePosterior` starts NUTS; the posterior variances
 * from a long pilot run that keeps the curvature mass (cached by key).
 */
function lightCurveTarget(key: string, fit: SimulatedFit): Target {
  const density = unconstrainedPosterior(fit.space, fit.likelihood, { jacobian: true });
  const start = fit.space.toUnconstrained(fit.space.physicalFromRecord(fit.initial));
  const mode = findMaximumPosterior(density, { starts: [start] }).x;
  const scales = modeScales(density, mode);
  const curvature = Float64Array.from(scales, (s) => s * s);
  const provisional: Target = { key, label: fit.label, density, centre: mode, startInverseMass: curvature, variance: curvature };
  const cacheFile = join(tmpdir(), `horologium-warmup-pilot-${key}.json`);
  let variance: Float64Array;
  if (existsSync(cacheFile)) {
    variance = Float64Array.from(JSON.parse(readFileSync(cacheFile, "utf8")) as number[]);
  } else {
    variance = drawVariances(runNuts(provisional, 99, "kept", PILOT_KEPT).draws);
    writeFileSync(cacheFile, JSON.stringify(Array.from(variance)));
  }
  return { ...provisional, variance };
}

const TARGETS: Record<string, () => Target> = {
  gauss: scaledGaussian,
  drw: () => lightCurveTarget("drw", dampedRandomWalkFit(250)),
  // A spotted star seen every 0.3 d for 66 days: about ten rotations of 6.3 d, decay time 24 d.
  qp: () => lightCurveTarget("qp", { ...quasiPeriodicFit(200, 2025, 0.3), label: "quasi-periodic, 200 points over 66 d" }),
};

const seeds = Number(process.argv[2] ?? 5);
const targetKeys = (process.argv[3] ?? "gauss,drw,qp").split(",");
const ways = (process.argv[4] ?? "schedule,oracle,kept").split(",") as Way[];
const firstSeed = Number(process.argv[5] ?? 1);
console.log(`NUTS warm-up: ${CHAINS} chains, ${WARMUP} warm-up + ${KEPT} kept iterations, seeds ${firstSeed}..${firstSeed + seeds - 1}`);
console.log("| target | way | step size | mass error [e-folds] | leapfrog / iteration | ESS min | gradients / ESS (seed range) | warm-up share | restarts |");
console.log("| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |");
for (const key of targetKeys) {
  const make = TARGETS[key];
  if (make === undefined) throw new RangeError(`unknown target ${key}; known: ${Object.keys(TARGETS).join(", ")}`);
  const target = make();
  ways.forEach((way, w) => {
    const runs = Array.from({ length: seeds }, (_, s) => runNuts(target, firstSeed + s, way));
    const mean = (f: (r: RunFigures) => number) => runs.reduce((a, r) => a + f(r), 0) / runs.length;
    const perSeed = runs.map((r) => r.gradients / r.essMin);
    const pooled = mean((r) => r.gradients) / mean((r) => r.essMin);
    console.log(
      `| ${w === 0 ? target.label : ""} | ${WAY_LABELS[way]} | ${mean((r) => r.stepSize).toPrecision(3)} | ${mean((r) => r.massError).toFixed(2)} | ` +
        `${mean((r) => r.stepsPerIteration).toFixed(1)} | ${mean((r) => r.essMin).toFixed(0)} | ` +
        `${pooled.toPrecision(3)} (${perSeed.reduce((a, b) => Math.min(a, b)).toPrecision(3)}..${perSeed.reduce((a, b) => Math.max(a, b)).toPrecision(3)}) | ` +
        `${(100 * mean((r) => r.warmupShare)).toFixed(0)}% | ${mean((r) => r.restarts).toFixed(1)} |`,
    );
  });
}
