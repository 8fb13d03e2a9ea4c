import { GaussianProcess } from "../gp/gaussian-process.js";
import {
  createParameterSpace,
  logUniformPrior,
  normalPrior,
  uniformPrior,
  type ParameterSpace,
  type ParameterSpec,
  type PhysicalLikelihood,
} from "../inference/index.js";
import type { Kernel } from "../kernels/index.js";
import { FactorizationError } from "../linalg/factorization-error.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { DataSummary } from "./data-summary.js";
import type { PeriodRange } from "./period-range.js";
import { dampedRandomWalkTerm, oscillatorTerm, quasiPeriodicTerm, type KernelTerm } from "./kernel-term.js";

/** The models of the trade. */
export type ModelName = "drw" | "oscillator" | "quasi-periodic";

/** The model names accepted by `fit --model`. */
export const MODEL_NAMES: readonly ModelName[] = ["drw", "oscillator", "quasi-periodic"];

/** Options that change a model's structure. */
export interface ModelStructure {
  /** Add a slow damped random walk for trends (parameters backgroundTau, backgroundSigma). */
  readonly background?: "drw";
  /** Fit a white-noise jitter term (always on when the light curve has no error column). */
  readonly jitter?: boolean;
  /**
   * A first guess of the period (oscillator, quasi-periodic), for example the periodogram's peak. Only
   * the optimiser's first start; never a prior.
   */
  readonly periodGuess?: number;
  /** The periods allowed (the period prior's bounds); default from the cadence and baseline ({@link PeriodRange}). */
  readonly periodRange?: PeriodRange;
}

/**
 * A Gaussian-process model of a light curve: kernel terms with named physical parameters, a constant mean,
 * an optional jitter, data-driven priors and a first guess.
 */
export interface LightCurveModel {
  readonly name: ModelName;
  readonly space: ParameterSpace;
  readonly terms: readonly KernelTerm[];
  /** Whether a white-noise jitter parameter is fitted. */
  readonly fitsJitter: boolean;
  /** A first guess by parameter name (the optimiser's first start). */
  readonly initialGuess: Readonly<Record<string, number>>;
  /** The kernel at a physical parameter vector (in `space.names` order). */
  kernelAt(physical: ArrayLike<number>): Kernel;
  /** The Gaussian process of the light curve at a physical parameter vector. */
  processAt(physical: ArrayLike<number>, lightCurve: LightCurve): GaussianProcess;
}

/**
 * Builds a model with priors derived from the data's own scales (`summary`):
 * - amplitudes (sigma, backgroundSigma): log-uniform from 1e-3 to 10 times the spread of the values;
 * - damping timescales (tau, backgroundTau): log-uniform from a tenth of the median cadence to ten times the
 *   baseline (Kozlowski 2017, A&A 597, A128: timescales beyond a tenth of the baseline are biased, so the
 *   prior must allow them for the warning to be meaningful);
 * - periods: log-uniform over `structure.periodRange`, by default from twice the typical spacing of
 *   visits on different nights (`summary.visitSpacing`) to the baseline (oscillator) or half of it
 *   (quasi-periodic, which needs two cycles to see a repeat: the range the fit's periodogram searches,
 *   {@link periodSearchRange}); quality: log-uniform on [0.05, 1000] for the oscillator;
 * - decayTime (quasi-periodic): log-uniform from the shortest period of that range to ten baselines, so
 *   that it reaches from a pattern that forgets itself within one cycle to one coherent over the whole
 *   light curve (then the data give only a lower limit, and the warnings say so); harmonicWeight: uniform on [0, 1];
 * - mean: normal around the median with ten times the spread; jitter: log-uniform from 1e-4 to 2 times the spread.
 */
export function buildModel(name: ModelName, summary: DataSummary, structure: ModelStructure = {}): LightCurveModel {
  const { spread, baseline, medianCadence, median } = summary;
  const amplitude = () => logUniformPrior(1e-3 * spread, 10 * spread);
  const timescale = () => logUniformPrior(medianCadence / 10, 10 * baseline);
  const terms: KernelTerm[] = [];
  const specs: ParameterSpec[] = [];
  const guess: Record<string, number> = {};
  const signal = Math.sqrt(Math.max(spread * spread - summary.medianError ** 2, 0.01 * spread * spread));
  const shortestPeriod = structure.periodRange?.shortest ?? periodSearchRange(summary).shortest;
  const longestPeriod = (cycles: number) => structure.periodRange?.longest ?? baseline / cycles;
  const clampPeriod = (value: number | undefined, upper: number) =>
    value !== undefined && value > shortestPeriod && value < upper ? value : Math.sqrt(shortestPeriod * upper);
  if (name === "drw") {
    terms.push(dampedRandomWalkTerm());
    specs.push({ name: "tau", prior: timescale() }, { name: "sigma", prior: amplitude() });
    Object.assign(guess, { tau: Math.max(baseline / 10, medianCadence), sigma: signal });
  } else if (name === "oscillator") {
    terms.push(oscillatorTerm());
    specs.push(
      { name: "period", prior: logUniformPrior(shortestPeriod, longestPeriod(1)) },
      { name: "quality", prior: logUniformPrior(0.05, 1000) },
      { name: "sigma", prior: amplitude() },
    );
    Object.assign(guess, { period: clampPeriod(structure.periodGuess, longestPeriod(1)), quality: 2, sigma: signal });
  } else if (name === "quasi-periodic") {
    const range = { shortest: shortestPeriod, longest: longestPeriod(2) };
    const decayPrior = logUniformPrior(range.shortest, 10 * baseline);
    const period = clampPeriod(structure.periodGuess, range.longest);
    terms.push(quasiPeriodicTerm());
    specs.push(
      { name: "period", prior: logUniformPrior(range.shortest, range.longest) },
      { name: "decayTime", prior: decayPrior },
      { name: "harmonicWeight", prior: uniformPrior(0, 1) },
      { name: "sigma", prior: amplitude() },
    );
    // The first start only (the optimiser moves it): a pattern that stays coherent for a few cycles.
    const decayTime = Math.min(Math.max(3 * period, decayPrior.lower * 1.01), decayPrior.upper / 1.01);
    Object.assign(guess, { period, decayTime, harmonicWeight: 0.3, sigma: signal });
  } else {
    throw new RangeError(`unknown model "${String(name)}" (choose ${MODEL_NAMES.join(", ")})`);
  }
  specs.push({ name: "mean", prior: normalPrior(median, 10 * spread) });
  guess.mean = median;
  if (structure.background === "drw") {
    terms.push(dampedRandomWalkTerm("backgroundSigma", "backgroundTau"));
    specs.push({ name: "backgroundTau", prior: timescale() }, { name: "backgroundSigma", prior: amplitude() });
    Object.assign(guess, { backgroundTau: baseline, backgroundSigma: signal / 2 });
  }
  const fitsJitter = structure.jitter === true || !summary.hasErrors;
  if (fitsJitter) {
    specs.push({ name: "jitter", prior: logUniformPrior(1e-4 * spread, 2 * spread) });
    guess.jitter = summary.hasErrors ? 0.1 * spread : 0.5 * spread;
  }
  const space = createParameterSpace(specs);
  const termIndex = terms.map((term) => Int32Array.from(term.names, (n) => space.names.indexOf(n)));
  const meanIndex = space.names.indexOf("mean");
  const jitterIndex = space.names.indexOf("jitter");
  const kernelAt = (physical: ArrayLike<number>): Kernel => {
    let kernel: Kernel | undefined;
    terms.forEach((term, k) => {
      const part = term.build(Array.from(termIndex[k], (i) => physical[i]));
      kernel = kernel ? kernel.plus(part) : part;
    });
    return kernel!;
  };
  return {
    name,
    space,
    terms,
    fitsJitter,
    initialGuess: guess,
    kernelAt,
    processAt: (physical, lightCurve) =>
      new GaussianProcess(kernelAt(physical), lightCurve.time, {
        errors: lightCurve.error ?? 0,
        mean: physical[meanIndex],
        jitter: jitterIndex >= 0 ? physical[jitterIndex] : 0,
      }),
  };
}

/**
 * The periods a periodic model considers by default, in the input time unit: from twice the typical
 * spacing of visits on different nights (`summary.visitSpacing`; at least a millionth of the baseline) to
 * half the baseline (two cycles). The fit passes its own range (`ModelStructure.periodRange`, from
 * `period-range.ts`, which honours --min-period and --max-period); the oscillator's reaches to the full baseline.
 */
export function periodSearchRange(summary: DataSummary): { readonly shortest: number; readonly longest: number } {
  return { shortest: Math.max(2 * summary.visitSpacing, summary.baseline * 1e-6), longest: summary.baseline / 2 };
}

/**
 * The model's log-likelihood and its gradient for one light curve, in physical parameters. The kernel's
 * gradient (sums of terms list their parameters term after term) maps back to the model's names one to
 * one. A covariance that cannot be factorised counts as an impossible point (-Infinity).
 */
export function modelLikelihood(model: LightCurveModel, lightCurve: LightCurve): PhysicalLikelihood {
  const names = model.space.names;
  const kernelIndex = Int32Array.from(model.terms.flatMap((term) => term.names.map((n) => names.indexOf(n))));
  const meanIndex = names.indexOf("mean");
  const jitterIndex = names.indexOf("jitter");
  const y = lightCurve.value;
  const processAt = processFactory(model, lightCurve);
  return {
    logLikelihood(physical) {
      try {
        return processAt(physical).logLikelihood(y);
      } catch (error) {
        if (error instanceof FactorizationError) return -Infinity;
        throw error;
      }
    },
    logLikelihoodAndGradient(physical, gradientOut) {
      try {
        const g = processAt(physical).logLikelihoodGradient(y);
        for (let i = 0; i < kernelIndex.length; i++) gradientOut[kernelIndex[i]] = g.kernel[i];
        gradientOut[meanIndex] = g.mean;
        if (jitterIndex >= 0) gradientOut[jitterIndex] = g.jitter;
        return g.value;
      } catch (error) {
        if (error instanceof FactorizationError) {
          gradientOut.fill(0);
          return -Infinity;
        }
        throw error;
      }
    },
  };
}

/**
 * `model.processAt` for one light curve, checking and copying its times and errors once: every later
 * call reuses them through `GaussianProcess.withKernel`, which is what a sampler needs at every step.
 */
export function processFactory(model: LightCurveModel, lightCurve: LightCurve): (physical: ArrayLike<number>) => GaussianProcess {
  const meanIndex = model.space.names.indexOf("mean");
  const jitterIndex = model.space.names.indexOf("jitter");
  let base: GaussianProcess | undefined;
  return (physical) => {
    if (!base) return (base = model.processAt(physical, lightCurve));
    return base.withKernel(model.kernelAt(physical), {
      mean: physical[meanIndex],
      jitter: jitterIndex >= 0 ? physical[jitterIndex] : 0,
    });
  };
}
