/**
 * Does the NUTS warm-up schedule ({@link planWarmup}) adapt as well as knowing the answer would? For each
 * target, NUTS runs three ways from the same starts and seeds, 4 chains, 500 warm-up and 1000 kept
 * iterations each:
 * - "schedule": the default warm-up (opening, threefold windows, closing) from the mass matrix a fit
 *   would start with (the curvature at the mode for the light-curve models, all ones for the Gaussian);
 * - "oracle": no mass-matrix window, the inverse mass fixed at the true posterior variances (known for the
 *   Gaussian; from a long pilot run for the light-curve models), the step size adapted as usual;
 * - "no windows": the starting mass matrix kept, step size adapted: what adaptation gains.
 * Printed per target and way: the mean final step size, the worst ratio of adapted inverse mass to the
 * posterior variance (max over parameters of |ln ratio|, in e-folds), leapfrog steps per kept
 * iteration, the smallest bulk ESS and gradient evaluations per effective sample.
 *
 * Run: npx tsx bench/nuts-warmup-compare.ts [seeds=3]
 */
import { bulkEffectiveSampleSize } from "../src/inference/effective-sample-size.js";
import type { PosteriorTarget } from "../src/inference/posterior-target.js";
import { findMaximumPosterior } from "../src/inference/maximum-posterior.js";
import { modeScales } from "../src/inference/mode-curvature.js";
import { createNutsSampler } from "../src/inference/nuts-sampler.js";
import { unconstrainedPosterior } from "../src/inference/unconstrained-posterior.js";
import { createRng } from "../src/random/rng.js";
import { dampedRandomWalkFit } from "./samplers-gp-models.js";

const WARMUP = 500;
const KEPT = 1000;
const CHAINS = 4;

interface Target {
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
    label: "Gaussian, sd 1e-3..1e3",
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
  readonly gradientsPerEss: number;
  readonly draws: Float64Array[][];
}

function runNuts(target: Target, seed: number, way: "schedule" | "oracle" | "no windows"): RunFigures {
  const rng = createRng(seed);
  const initial = Array.from({ length: CHAINS }, () =>
    Float64Array.from(target.centre, (c, i) => c + 0.1 * Math.sqrt(target.startInverseMass[i]) * rng.normal()),
  );
  const sampler = createNutsSampler(target.density, initial, `warmup-bench-${seed}`, {
    warmup: WARMUP,
    initialInverseMass: way === "oracle" ? target.variance : target.startInverseMass,
    ...(way === "schedule" ? {} : { warmupPlan: { windowStarts: [], windowEnds: [] } }),
  });
  for (let i = 0; i < WARMUP + KEPT; i++) sampler.iterate();
  const details = sampler.details() as { stepSizes: number[]; inverseMassDiagonals: number[][]; leapfrogSteps: number };
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
    stepsPerIteration: details.leapfrogSteps / (CHAINS * (WARMUP + KEPT)),
    essMin,
    gradientsPerEss: details.leapfrogSteps / essMin,
    draws,
  };
}

/** The damped-random-walk fit of the sampler benchmark, with its posterior variances from a long pilot run. */
function dampedRandomWalkTarget(): Target {
  const fit = dampedRandomWalkFit(250);
  const density = unconstrainedPosterior(fit.space, fit.likelihood, { jacobian: true });
  const start = fit.space.toUnconstrained(fit.space.physicalFromRecord(fit.initial));
  const mode = findMaximumPosterior(density, { starts: [start] }).x;
  const scales = modeScales(density, mode);
  const provisional: Target = {
    label: "damped random walk, 250 points",
    density,
    centre: mode,
    startInverseMass: Float64Array.from(scales, (s) => s * s),
    variance: Float64Array.from(scales, (s) => s * s),
  };
  // Pilot: the schedule itself, run four times longer; its draws give the posterior variances.
  const pilot = runNuts(provisional, 99, "schedule");
  const variance = Float64Array.from(pilot.draws, (chains) => {
    const all = chains.flatMap((c) => Array.from(c));
    const mean = all.reduce((a, b) => a + b, 0) / all.length;
    return all.reduce((a, b) => a + (b - mean) ** 2, 0) / (all.length - 1);
  });
  return { ...provisional, variance };
}

const seeds = Number(process.argv[2] ?? 3);
const only = process.argv[3];
const targets = [...(only === "drw" ? [] : [scaledGaussian()]), ...(only === "gauss" ? [] : [dampedRandomWalkTarget()])];
console.log(`NUTS warm-up: ${CHAINS} chains, ${WARMUP} warm-up + ${KEPT} kept iterations, ${seeds} seeds; figures are means over seeds`);
console.log("target                           way          step size  mass error [e-folds]  leapfrog/iter  ESS min  gradients/ESS");
for (const target of targets) {
  for (const way of (only === undefined ? ["schedule", "oracle", "no windows"] : ["schedule"]) as ("schedule" | "oracle" | "no windows")[]) {
    const runs = Array.from({ length: seeds }, (_, s) => runNuts(target, 1 + s, way));
    const mean = (f: (r: RunFigures) => number) => runs.reduce((a, r) => a + f(r), 0) / runs.length;
    console.log(
      [
        target.label.padEnd(32),
        way.padEnd(12),
        mean((r) => r.stepSize).toPrecision(3).padStart(9),
        mean((r) => r.massError).toFixed(2).padStart(21),
        mean((r) => r.stepsPerIteration).toFixed(1).padStart(14),
        mean((r) => r.essMin).toFixed(0).padStart(8),
        mean((r) => r.gradientsPerEss).toFixed(1).padStart(14),
      ].join(" "),
    );
  }
}
