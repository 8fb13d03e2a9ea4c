/**
 * Gaussian-process models for the sampler benchmark and the calibration check: a damped random walk
 * (quasar) and a quasi-periodic rotation model, each as a parameter space with priors and a likelihood
 * with its gradient, on simulated light curves of an invented survey. Shared by bench/samplers-*.ts and
 * test/inference.
 */
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { continuousSpaceCadence, seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import { createParameterSpace, type ParameterSpace } from "../src/inference/parameter-space.js";
import type { PhysicalLikelihood } from "../src/inference/unconstrained-posterior.js";
import { logUniformPrior, normalPrior, uniformPrior } from "../src/inference/priors.js";
import { createRng, type Rng } from "../src/random/rng.js";
import type { LightCurve } from "../src/lightcurve/light-curve.js";
import type { ModelName } from "../src/models/light-curve-model.js";

/** A model, its data and the parameter values the data were drawn from. */
export interface SimulatedFit {
  readonly label: string;
  readonly space: ParameterSpace;
  readonly likelihood: PhysicalLikelihood;
  readonly time: Float64Array;
  readonly value: Float64Array;
  readonly error: Float64Array;
  readonly truth: Readonly<Record<string, number>>;
  /** A first guess such as a periodogram would give. */
  readonly initial: Readonly<Record<string, number>>;
}

/** Damped-random-walk parameters in the order of the fit result: tau (days), sigma (mag), mean (mag). */
export function dampedRandomWalkSpace(): ParameterSpace {
  return createParameterSpace([
    { name: "tau", prior: logUniformPrior(5, 2000) },
    { name: "sigma", prior: logUniformPrior(0.02, 1) },
    { name: "mean", prior: normalPrior(19, 0.5) },
  ]);
}

/**
 * ln L of a damped random walk with per-point errors, from the engine: x = (tau, sigma, mean). The
 * gradient maps the engine's d/d(sigma, tau) and d/d(mean) onto the space's order.
 */
export function dampedRandomWalkLikelihood(time: Float64Array, value: Float64Array, error: Float64Array): PhysicalLikelihood {
  const process = (x: Float64Array): GaussianProcess =>
    new GaussianProcess(kernels.dampedRandomWalk({ sigma: x[1], tau: x[0] }), time, { errors: error, mean: x[2] });
  return {
    logLikelihood: (x) => process(x).logLikelihood(value),
    logLikelihoodAndGradient: (x, g) => {
      const r = process(x).logLikelihoodGradient(value);
      g[0] = r.kernel[1];
      g[1] = r.kernel[0];
      g[2] = r.mean;
      return r.value;
    },
  };
}

/**
 * Seasonal ground-based times: 8-month seasons with a visit every 3 nights (30% lost to weather) and
 * 4-month gaps, trimmed to `n` points.
 */
export function seasonalTimes(n: number, rng: Rng): Float64Array {
  const times = seasonalGroundCadence({ start: 60000, seasons: 12, seasonLength: 243, revisitInterval: 3 }, rng);
  if (times.length < n) throw new RangeError(`seasonal cadence gave ${times.length} times, fewer than ${n}`);
  return times.slice(0, n);
}

/** Draws a damped-random-walk light curve with the given parameters at the given times. */
export function simulateDampedRandomWalk(
  time: Float64Array,
  truth: { tau: number; sigma: number; mean: number },
  errorLevel: number,
  rng: Rng,
): { value: Float64Array; error: Float64Array } {
  const error = Float64Array.from(time, () => errorLevel * (0.8 + 0.4 * rng.uniform()));
  const latent = new GaussianProcess(kernels.dampedRandomWalk({ sigma: truth.sigma, tau: truth.tau }), time, {
    mean: truth.mean,
  }).priorDraw(rng);
  const value = Float64Array.from(latent, (v, i) => v + error[i] * rng.normal());
  return { value, error };
}

/** A quasar of the invented Lantern Deep Survey: a damped random walk, 250 points over about 3 seasons. */
export function dampedRandomWalkFit(n = 250, seed = 2024): SimulatedFit {
  const rng = createRng(seed);
  const time = seasonalTimes(n, rng);
  const truth = { tau: 120, sigma: 0.25, mean: 19.2 };
  const { value, error } = simulateDampedRandomWalk(time, truth, 0.05, rng);
  return {
    label: `damped random walk, ${n} points`,
    space: dampedRandomWalkSpace(),
    likelihood: dampedRandomWalkLikelihood(time, value, error),
    time,
    value,
    error,
    truth,
    initial: { tau: 100, sigma: 0.2, mean: 19.2 },
  };
}

/** Quasi-periodic parameters: period (days), decayTime (days), harmonicWeight, sigma (relative flux), mean. */
export function quasiPeriodicSpace(): ParameterSpace {
  return createParameterSpace([
    { name: "period", prior: logUniformPrior(0.5, 40) },
    { name: "decayTime", prior: logUniformPrior(0.5, 400) },
    { name: "harmonicWeight", prior: uniformPrior(0, 1) },
    { name: "sigma", prior: logUniformPrior(1e-4, 0.5) },
    { name: "mean", prior: normalPrior(1, 0.1) },
  ]);
}

/** ln L of the quasi-periodic model, x = (period, decayTime, harmonicWeight, sigma, mean). */
export function quasiPeriodicLikelihood(time: Float64Array, value: Float64Array, error: Float64Array): PhysicalLikelihood {
  const process = (x: Float64Array): GaussianProcess =>
    new GaussianProcess(
      kernels.quasiPeriodic({ sigma: x[3], period: x[0], decayTime: x[1], harmonicWeight: x[2] }),
      time,
      { errors: error, mean: x[4] },
    );
  return {
    logLikelihood: (x) => process(x).logLikelihood(value),
    logLikelihoodAndGradient: (x, g) => {
      // Engine order: sigma, period, decayTime, harmonicWeight.
      const r = process(x).logLikelihoodGradient(value);
      g[0] = r.kernel[1];
      g[1] = r.kernel[2];
      g[2] = r.kernel[3];
      g[3] = r.kernel[0];
      g[4] = r.mean;
      return r.value;
    },
  };
}

/**
 * A spotted star of the invented survey's space stare: a quasi-periodic light curve of `n` points,
 * one every `intervalDays` (default an hour), rotation period 6.3 d.
 */
export function quasiPeriodicFit(n = 1000, seed = 2025, intervalDays = 1 / 24): SimulatedFit {
  const rng = createRng(seed);
  const all = continuousSpaceCadence({ start: 0, duration: n * 1.1 * intervalDays, interval: intervalDays }, rng);
  const time = all.slice(0, n);
  const truth = { period: 6.3, decayTime: 24, harmonicWeight: 0.3, sigma: 0.01, mean: 1 };
  const error = Float64Array.from(time, () => 0.002);
  const latent = new GaussianProcess(
    kernels.quasiPeriodic({ sigma: truth.sigma, period: truth.period, decayTime: truth.decayTime, harmonicWeight: truth.harmonicWeight }),
    time,
    { mean: truth.mean },
  ).priorDraw(rng);
  const value = Float64Array.from(latent, (v, i) => v + error[i] * rng.normal());
  return {
    label: `quasi-periodic, ${n} points`,
    space: quasiPeriodicSpace(),
    likelihood: quasiPeriodicLikelihood(time, value, error),
    time,
    value,
    error,
    truth,
    initial: { period: 6, decayTime: 10, harmonicWeight: 0.5, sigma: 0.01, mean: 1 },
  };
}

/** One case of the adapter measurements: a simulated fit, its data as a light curve, and the model of src/models that fits it. */
export interface AdapterCase {
  readonly fit: SimulatedFit;
  readonly model: ModelName;
  readonly lightCurve: LightCurve;
}

/**
 * The cases on which the models' likelihood adapters are timed (bench/engine-adapters.ts,
 * bench/samplers-gradient-cost.ts): the damped random walk of 250 points and the quasi-periodic light
 * curve of 1000 points, as light curves in magnitudes.
 */
export function adapterCases(): AdapterCase[] {
  const cases: Array<[SimulatedFit, ModelName]> = [
    [dampedRandomWalkFit(250), "drw"],
    [quasiPeriodicFit(1000), "quasi-periodic"],
  ];
  return cases.map(([fit, model]) => ({
    fit,
    model,
    lightCurve: {
      time: fit.time,
      value: fit.value,
      error: fit.error,
      unit: "mag",
      provenance: { source: "simulated", timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0, sorted: false },
    },
  }));
}
