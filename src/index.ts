/**
 * Horologium: Gaussian-process models of irregularly sampled light curves with linear-cost semiseparable
 * kernels, posterior sampling, diagnostics and reports.
 *
 * @example
 * import { kernels, GaussianProcess } from "horologium";
 * const gp = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 300 }), times, { errors, mean: 19.3 });
 * gp.logLikelihood(values);
 * gp.given(values).at(newTimes); // { mean, variance }
 *
 * @module
 */
export { kernels, Kernel, SumKernel, ProductKernel, CarmaKernel, DampedRandomWalkKernel, Matern32Kernel, OscillatorKernel, PeriodicSquaredExponentialKernel, QuasiPeriodicKernel } from "./kernels/index.js";
export { KERNEL_FAMILIES, parameterUnit, parameterValidity } from "./kernels/index.js";
export type {
  AnyKernelFamily,
  FamilyParameter,
  KernelConstructors,
  KernelFamily,
  ParameterKind,
  ParameterUnit,
  CarmaOscillation,
  CarmaParameters,
  DampedRandomWalkParameters,
  Matern32Parameters,
  OscillatorParameters,
  PeriodicSquaredExponentialParameters,
  QuasiPeriodicParameters,
} from "./kernels/index.js";
export { GaussianProcess } from "./gp/gaussian-process.js";
export { DenseGaussianProcess } from "./gp/dense-gaussian-process.js";
export { SemiseparableConditionedProcess } from "./gp/conditioned-process.js";
export { DenseConditionedProcess } from "./gp/dense-conditioned-process.js";
export { MAX_COVARIANCE_SIZE, type ConditionedProcess, type GaussianProcessOptions, type GradientResult, type MeanAndVariance } from "./gp/gp-options.js";
export { FactorizationError } from "./linalg/factorization-error.js";
export type { SemiseparableForm } from "./linalg/semiseparable-form.js";
export type { TransitionBlock } from "./linalg/transition-block.js";
export { createRng, childSeed, type Rng } from "./random/rng.js";

export * as inference from "./inference/index.js";

export type { LightCurve, LightCurveProvenance, PhotometricUnit } from "./lightcurve/light-curve.js";
export { InputError } from "./errors/input-error.js";
export { parseLightCurveBytes } from "./lightcurve/parse-light-curve-bytes.js";
export { seasonalGroundCadence, continuousSpaceCadence } from "./lightcurve/cadence.js";
export { photometricError } from "./lightcurve/photometric-error.js";

export { computePeriodogram, type Periodogram } from "./periodogram/periodogram.js";

export { fitLightCurve, fitLightCurveDetailed, type DetailedFit } from "./models/fit-light-curve.js";
export type { FitOptions } from "./models/fit-options.js";
export type { FitResult, ParameterSummary, FitDiagnostics, FitDataSummary } from "./models/fit-result.js";
export { buildModel, modelLikelihood, modelParameterNames, MODEL_NAMES, type ModelName, type LightCurveModel } from "./models/light-curve-model.js";
export { posteriorPredictive, type PredictiveCurve } from "./models/posterior-predictive.js";
export { compareModels, type ModelComparison } from "./models/compare-models.js";
export { summarizeLightCurve, type DataSummary } from "./models/data-summary.js";
export { HOROLOGIUM_VERSION } from "./version.js";
