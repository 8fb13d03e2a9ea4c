import { MultiBandProcess, type BandParameters } from "../gp/multi-band-process.js";
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
import type { LightCurve } from "../lightcurve/light-curve.js";
import { medianOf } from "../numerics/order-statistics.js";
import { isImpossibleParameters } from "./impossible-parameters.js";
import { summarizeLightCurve, type DataSummary } from "./data-summary.js";
import { buildModel, type ModelName, type ModelStructure } from "./light-curve-model.js";

/** Options that shape a joint multi-band model. */
export interface JointStructure extends ModelStructure {
  /** Fit a lag per band relative to the reference band (quasar continuum lags). */
  readonly lags?: boolean;
  /** The reference band's name (default: the band with the most points; ties to the first listed). */
  readonly referenceBand?: string;
}

/**
 * One shared process seen in several bands: the model's kernel parameters (the reference band's
 * `sigma`), then per band `amplitude.<band>` (not for the reference, fixed at 1), `mean.<band>`,
 * `jitter.<band>` (bands without errors, or all with `jitter`) and, with lags, `lag.<band>` (not for the
 * reference, fixed at 0).
 */
export interface JointModel {
  readonly name: ModelName;
  readonly space: ParameterSpace;
  /** Band names in the order of the light curves. */
  readonly bands: readonly string[];
  /** Index of the reference band. */
  readonly reference: number;
  readonly lags: boolean;
  /** The prior half-width of every lag (input time unit). */
  readonly lagRange: number;
  /** The joint data's scales (baseline and cadence of all bands together; spread of the reference band). */
  readonly summary: DataSummary;
  /** A first guess by parameter name. */
  readonly initialGuess: Readonly<Record<string, number>>;
  /** Names of the shared kernel's parameters (in the kernel's gradient order). */
  readonly kernelNames: readonly string[];
  kernelAt(physical: ArrayLike<number>): Kernel;
  bandParametersAt(physical: ArrayLike<number>): BandParameters;
}

/** Lags may range over this many joint median cadences either way (capped at a quarter of the baseline). */
export const LAG_RANGE_CADENCES = 20;

/** The reference band: the one named, or the one with the most points (the first of equals). */
export function referenceBandIndex(lightCurves: readonly LightCurve[], name?: string): number {
  if (name !== undefined) {
    const index = lightCurves.findIndex((lc) => lc.band === name);
    if (index < 0) throw new RangeError(`reference band "${name}" is not among the bands (${lightCurves.map((lc) => lc.band).join(", ")})`);
    return index;
  }
  let best = 0;
  lightCurves.forEach((lc, b) => {
    if (lc.time.length > lightCurves[best].time.length) best = b;
  });
  return best;
}

/** The scales of all bands together: joint baseline, cadence and spacing; the reference band's values. */
export function jointSummary(lightCurves: readonly LightCurve[], reference: number): DataSummary {
  const own = summarizeLightCurve(lightCurves[reference]);
  const times = Float64Array.from(lightCurves.flatMap((lc) => Array.from(lc.time))).sort();
  const spacings: number[] = [];
  let minimumSpacing = Infinity;
  for (let i = 1; i < times.length; i++) {
    const d = times[i] - times[i - 1];
    if (d > 0) {
      spacings.push(d);
      if (d < minimumSpacing) minimumSpacing = d;
    }
  }
  return {
    ...own,
    n: times.length,
    baseline: times[times.length - 1] - times[0],
    medianCadence: spacings.length ? medianOf(spacings) : 0,
    minimumSpacing: spacings.length ? minimumSpacing : 0,
    hasErrors: lightCurves.every((lc) => lc.error !== undefined),
  };
}

/**
 * Builds the joint model with priors from each band's own data:
 * - the shared process: the single-band model's priors (`buildModel`) on the joint baseline and cadence,
 *   with the reference band's spread for its sigma;
 * - amplitude.<band>: log-uniform over a factor 100 either way around the ratio of the band's spread to
 *   the reference band's;
 * - mean.<band>: normal around the band's median, ten times its spread wide;
 * - jitter.<band>: log-uniform from 1e-4 to 2 times the band's spread;
 * - lag.<band>: uniform on +-L, L = LAG_RANGE_CADENCES joint median cadences (at most a quarter of the
 *   baseline): lags much longer than the sampling's spacing are aliased by the seasonal gaps, and what
 *   the joint sampling resolves is a small multiple of its cadence (common practice).
 */
export function buildJointModel(name: ModelName, lightCurves: readonly LightCurve[], structure: JointStructure = {}): JointModel {
  if (lightCurves.length < 2) throw new RangeError(`a joint model needs at least two bands, got ${lightCurves.length}`);
  const bands = lightCurves.map((lc, b) => lc.band ?? `band${b + 1}`);
  const reference = referenceBandIndex(lightCurves, structure.referenceBand);
  const summary = jointSummary(lightCurves, reference);
  const single = buildModel(name, summary, { ...structure, jitter: false });
  const kernelNames = single.terms.flatMap((term) => term.names);
  const specs: ParameterSpec[] = single.space.specs.filter((spec) => kernelNames.includes(spec.name));
  const guess: Record<string, number> = Object.fromEntries(kernelNames.map((n) => [n, single.initialGuess[n]]));
  const lagRange = Math.min(LAG_RANGE_CADENCES * summary.medianCadence, summary.baseline / 4);
  const referenceSpread = summarizeLightCurve(lightCurves[reference]).spread;
  lightCurves.forEach((lc, b) => {
    const own = summarizeLightCurve(lc);
    const band = bands[b];
    const ratio = own.spread / referenceSpread;
    if (b === reference) specs.push({ name: `amplitude.${band}`, fixed: 1 });
    else {
      specs.push({ name: `amplitude.${band}`, prior: logUniformPrior(ratio / 100, ratio * 100) });
      guess[`amplitude.${band}`] = ratio;
    }
    specs.push({ name: `mean.${band}`, prior: normalPrior(own.median, 10 * own.spread) });
    guess[`mean.${band}`] = own.median;
    if (structure.jitter === true || !own.hasErrors) {
      specs.push({ name: `jitter.${band}`, prior: logUniformPrior(1e-4 * own.spread, 2 * own.spread) });
      guess[`jitter.${band}`] = own.hasErrors ? 0.1 * own.spread : 0.5 * own.spread;
    }
    if (structure.lags) {
      if (b === reference) specs.push({ name: `lag.${band}`, fixed: 0 });
      else {
        specs.push({ name: `lag.${band}`, prior: uniformPrior(-lagRange, lagRange) });
        guess[`lag.${band}`] = 0;
      }
    }
  });
  const space = createParameterSpace(specs);
  const index = (n: string) => space.names.indexOf(n);
  const kernelIndex = Int32Array.from(kernelNames, index);
  const amplitudeIndex = Int32Array.from(bands, (b) => index(`amplitude.${b}`));
  const meanIndex = Int32Array.from(bands, (b) => index(`mean.${b}`));
  const jitterIndex = Int32Array.from(bands, (b) => index(`jitter.${b}`));
  const lagIndex = Int32Array.from(bands, (b) => index(`lag.${b}`));
  // The shared kernel is built by the single-band model from its own parameter vector.
  const singleIndex = Int32Array.from(kernelNames, (n) => single.space.names.indexOf(n));
  const singleVector = single.space.physicalFromRecord(single.initialGuess);
  const pick = (physical: ArrayLike<number>, where: Int32Array) => Float64Array.from(where, (i) => (i >= 0 ? physical[i] : 0));
  return {
    name,
    space,
    bands,
    reference,
    lags: structure.lags === true,
    lagRange,
    summary,
    initialGuess: guess,
    kernelNames,
    kernelAt: (physical) => {
      for (let k = 0; k < kernelIndex.length; k++) singleVector[singleIndex[k]] = physical[kernelIndex[k]];
      return single.kernelAt(singleVector);
    },
    bandParametersAt: (physical) => ({
      amplitude: pick(physical, amplitudeIndex),
      mean: pick(physical, meanIndex),
      jitter: pick(physical, jitterIndex),
      lag: pick(physical, lagIndex),
    }),
  };
}

/** The joint process of the bands at a physical parameter vector. */
export function jointProcessAt(model: JointModel, lightCurves: readonly LightCurve[], physical: ArrayLike<number>): MultiBandProcess {
  return new MultiBandProcess(
    model.kernelAt(physical),
    lightCurves.map((lc, b) => ({ name: model.bands[b], time: lc.time, values: lc.value, errors: lc.error ?? 0 })),
    model.bandParametersAt(physical),
  );
}

/**
 * The joint model's log-likelihood and gradient in physical parameters; the bands' times, values and
 * errors are checked once and reused at every step. A covariance that cannot be factorised counts as an
 * impossible point (-Infinity).
 */
export function jointLikelihood(model: JointModel, lightCurves: readonly LightCurve[]): PhysicalLikelihood {
  const names = model.space.names;
  const kernelIndex = Int32Array.from(model.kernelNames, (n) => names.indexOf(n));
  const byBand = (prefix: string) => Int32Array.from(model.bands, (b) => names.indexOf(`${prefix}.${b}`));
  const amplitudeIndex = byBand("amplitude");
  const meanIndex = byBand("mean");
  const jitterIndex = byBand("jitter");
  const lagIndex = byBand("lag");
  let base: MultiBandProcess | undefined;
  const processAt = (physical: Float64Array): MultiBandProcess => {
    if (!base) return (base = jointProcessAt(model, lightCurves, physical));
    return base.withParameters(model.kernelAt(physical), model.bandParametersAt(physical));
  };
  const impossible = (error: unknown): number => {
    if (isImpossibleParameters(error)) return -Infinity;
    throw error;
  };
  return {
    logLikelihood(physical) {
      try {
        return processAt(physical).logLikelihood();
      } catch (error) {
        return impossible(error);
      }
    },
    logLikelihoodAndGradient(physical, gradientOut) {
      try {
        const g = processAt(physical).logLikelihoodGradient({ lags: model.lags });
        for (let i = 0; i < kernelIndex.length; i++) gradientOut[kernelIndex[i]] = g.kernel[i];
        const scatter = (where: Int32Array, values: Float64Array) => {
          for (let b = 0; b < where.length; b++) if (where[b] >= 0) gradientOut[where[b]] = values[b];
        };
        scatter(amplitudeIndex, g.amplitude);
        scatter(meanIndex, g.mean);
        scatter(jitterIndex, g.jitter);
        scatter(lagIndex, g.lag);
        return g.value;
      } catch (error) {
        gradientOut.fill(0);
        return impossible(error);
      }
    },
  };
}
