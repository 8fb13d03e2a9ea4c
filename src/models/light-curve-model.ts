import { GaussianProcess } from "../gp/gaussian-process.js";
import {
  createParameterSpace,
  logUniformPrior,
  normalPrior,
  type ParameterSpace,
  type ParameterSpec,
  type PhysicalLikelihood,
} from "../inference/index.js";
import { dampedRandomWalkFamily } from "../kernels/damped-random-walk.js";
import { familyOfModel, KERNEL_FAMILIES, type AnyKernelFamily, type FamilyParameter, type Kernel, type ModelName as FamilyModelName } from "../kernels/index.js";
import { isImpossibleParameters, logLikelihoodOrImpossible } from "./impossible-parameters.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { DataSummary } from "./data-summary.js";
import type { PeriodRange } from "./period-range.js";
import { familyTerm, type KernelTerm } from "./kernel-term.js";
import { guessForKind, priorForKind, type PriorScales } from "./parameter-priors.js";

import { carmaPriors, carmaTerm, type CarmaOrder } from "./carma-model.js";

/**
 * The models of the trade: one per kernel family that declares one (kernels/families.ts), and CARMA,
 * whose parameters depend on its order (`ModelStructure.order`, carma-model.ts).
 */
export type ModelName = FamilyModelName | "carma";

/**
 * The model names accepted by `fit --model`: one per kernel family that declares a model of the trade
 * (kernels/families.ts), in the families' order.
 */
export const MODEL_NAMES: readonly ModelName[] = [
  ...(KERNEL_FAMILIES as readonly AnyKernelFamily[]).flatMap((family) => (family.model ? [family.model.name as ModelName] : [])),
  "carma",
];

/**
 * A model's kernel parameters in the order of its results: the family's parameters with the amplitude last
 * (drw: tau, sigma; oscillator: period, quality, sigma; quasi-periodic: period, decayTime, harmonicWeight, sigma).
 */
function modelOrder(family: AnyKernelFamily): FamilyParameter[] {
  return [...family.parameters.filter((p) => p.kind !== "amplitude"), ...family.parameters.filter((p) => p.kind === "amplitude")];
}

/** The parameters of a model without a background or jitter, in the order of its results: its kernel's, then `mean`. */
export function modelParameterNames(name: ModelName): string[] {
  if (name === "carma") return ["sigma", "mean"]; // the rest depend on the order
  return [...modelOrder(familyOfModel(name)).map((p) => p.name), "mean"];
}

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
  /** The order of a CARMA model (required for "carma"). */
  readonly order?: CarmaOrder;
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
 * Builds the model of the trade on the kernel family that declares `name` (kernels/families.ts), with
 * priors derived from the data's own scales (`summary`), each parameter's by its kind (`priorForKind` in
 * parameter-priors.ts: amplitudes from the spread, timescales from the cadence to ten baselines, periods
 * over the period range, coherence times from the shortest period to ten baselines, quality factors on
 * [0.05, 1000], fractions uniform), and a first guess by kind (`guessForKind`). Periods run over
 * `structure.periodRange`, by default from twice the typical spacing of visits on different nights
 * (`periodSearchRange`) to the baseline divided by the cycles the model needs (oscillator 1,
 * quasi-periodic 2: a rotation must repeat to be seen). Then:
 * - mean: normal around the median with ten times the spread;
 * - background (a damped random walk for trends): backgroundTau and backgroundSigma, priors as tau and sigma;
 * - jitter: log-uniform from 1e-4 to 2 times the spread.
 */
export function buildModel(name: ModelName, summary: DataSummary, structure: ModelStructure = {}): LightCurveModel {
  if (!MODEL_NAMES.includes(name)) throw new RangeError(`unknown model "${String(name)}" (choose ${MODEL_NAMES.join(", ")})`);
  const family = name === "carma" ? undefined : familyOfModel(name);
  const { spread, baseline, median } = summary;
  const range = periodSearchRange(summary);
  const scales: PriorScales = {
    summary,
    shortestPeriod: structure.periodRange?.shortest ?? range.shortest,
    longestPeriod: structure.periodRange?.longest ?? baseline / (family?.model?.periodCycles ?? 1),
    ...(structure.periodGuess !== undefined ? { periodGuess: structure.periodGuess } : {}),
  };
  const terms: KernelTerm[] = [];
  const specs: ParameterSpec[] = [];
  const guess: Record<string, number> = {};
  if (family) {
    terms.push(familyTerm(family));
    for (const parameter of modelOrder(family)) {
      const prior = priorForKind(parameter.kind, scales);
      specs.push({ name: parameter.name, prior });
      guess[parameter.name] = guessForKind(parameter.kind, scales, prior);
    }
  } else {
    // CARMA: the parameters follow the order (carma-model.ts); the amplitude as every model's.
    if (!structure.order) throw new RangeError('the "carma" model needs an order (p, q)');
    terms.push(carmaTerm(structure.order));
    const amplitude = priorForKind("amplitude", scales);
    specs.push({ name: "sigma", prior: amplitude });
    guess.sigma = guessForKind("amplitude", scales, amplitude);
    const parts = carmaPriors(structure.order, { shortestPeriod: scales.shortestPeriod, baseline, medianCadence: summary.medianCadence });
    for (const spec of parts.specs) specs.push(spec);
    Object.assign(guess, parts.guess);
  }
  const signal = guessForKind("amplitude", scales, priorForKind("amplitude", scales));
  specs.push({ name: "mean", prior: normalPrior(median, 10 * spread) });
  guess.mean = median;
  if (structure.background === "drw") {
    terms.push(familyTerm(dampedRandomWalkFamily, { sigma: "backgroundSigma", tau: "backgroundTau" }));
    specs.push(
      { name: "backgroundTau", prior: priorForKind("timescale", scales) },
      { name: "backgroundSigma", prior: priorForKind("amplitude", scales) },
    );
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
 * one. A covariance that cannot be factorised, or coincident CARMA roots, count as an impossible point (-Infinity).
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
      return logLikelihoodOrImpossible(() => processAt(physical).logLikelihood(y));
    },
    logLikelihoodAndGradient(physical, gradientOut) {
      try {
        const g = processAt(physical).logLikelihoodGradient(y);
        for (let i = 0; i < kernelIndex.length; i++) gradientOut[kernelIndex[i]] = g.kernel[i];
        gradientOut[meanIndex] = g.mean;
        if (jitterIndex >= 0) gradientOut[jitterIndex] = g.jitter;
        return g.value;
      } catch (error) {
        if (isImpossibleParameters(error)) {
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
