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
export type { AnyKernelFamily, FamilyParameter, KernelConstructors, KernelFamily, ParameterKind, ParameterUnit } from "./kernels/index.js";
export type { CarmaOscillation, CarmaParameters, DampedRandomWalkParameters, Matern32Parameters, OscillatorParameters } from "./kernels/index.js";
export type { PeriodicSquaredExponentialParameters, QuasiPeriodicParameters } from "./kernels/index.js";
export { GaussianProcess } from "./gp/gaussian-process.js";
export { DenseGaussianProcess } from "./gp/dense-gaussian-process.js";
export { SemiseparableConditionedProcess } from "./gp/conditioned-process.js";
export { DenseConditionedProcess } from "./gp/dense-conditioned-process.js";
export type { ConditionedInputs } from "./gp/conditioned-inputs.js";
export { MAX_COVARIANCE_SIZE, type ConditionedProcess, type GaussianProcessOptions, type GradientResult, type MeanAndVariance } from "./gp/process-interface.js";
export { FactorizationError } from "./linalg/factorization-error.js";
export type { SemiseparableForm } from "./linalg/semiseparable-form.js";
export type { SemiseparableFactorization } from "./linalg/semiseparable-factorization.js";
export type { DenseCholesky } from "./linalg/dense-cholesky.js";
export type { GradientWorkspace } from "./linalg/semiseparable-gradient.js";
export type { MeanMarginal, MeanPrior } from "./linalg/mean-marginal-likelihood.js";
export type { TransitionBlock } from "./linalg/transition-block.js";
export { createRng, childSeed, type Rng } from "./random/rng.js";

export * as inference from "./inference/index.js";

export type { LightCurve, LightCurveProvenance, PhotometricUnit } from "./lightcurve/light-curve.js";
export { InputError } from "./errors/input-error.js";
export { parseLightCurveBytes, type LightCurveReadOptions } from "./lightcurve/parse-light-curve-bytes.js";
export type { LightCurveSet } from "./lightcurve/assemble-light-curves.js";
export type { LightCurveFormat } from "./lightcurve/light-curve-format.js";
export type { Delimiter } from "./lightcurve/delimited-text.js";
export { seasonalGroundCadence, continuousSpaceCadence, type SeasonalCadenceOptions, type ContinuousCadenceOptions } from "./lightcurve/cadence.js";
export { photometricError, type PhotometricErrorOptions } from "./lightcurve/photometric-error.js";

export { computePeriodogram, type Periodogram, type PeriodogramOptions, type RankedPeak } from "./periodogram/periodogram.js";
export type { FrequencyGrid, FrequencyGridOptions } from "./periodogram/frequency-grid.js";
export type { SampledSeries } from "./periodogram/time-series.js";
export type { SinusoidFit } from "./periodogram/sinusoid-fit.js";

export { fitLightCurve, fitLightCurveDetailed, type DetailedFit } from "./models/fit-light-curve.js";
export type { StageSeconds } from "./models/fit-stage-timer.js";
export type { FitOptions } from "./models/fit-options.js";
export { RESULT_FORMAT_VERSION, type FitResult, type ParameterSummary, type FitDiagnostics, type FitDataSummary } from "./models/fit-result.js";
export type { FitParameterSummary, DerivedSummary, FitChoices, RobustNoiseSummary, PriorDescription } from "./models/fit-result.js";
export type { PeriodModeSummary, StoredPosteriorSample, JointBandsSummary } from "./models/fit-result.js";
export type { RobustFlaggedPoint, RobustWeightSummary, StoredImportanceWeights } from "./models/fit-result.js";
export type { EvidencePreference, EvidenceStrength } from "./models/evidence-scale.js";
export { parseFitResult } from "./models/parse-fit-result.js";
export type { KernelTerm } from "./models/kernel-term.js";
export type { ModelStanding } from "./models/compare-models.js";
export type { ModelStructure } from "./models/light-curve-model.js";
export type { PeriodMode } from "./models/period-modes.js";
export type { PeriodLimits, PeriodRange } from "./models/period-range.js";
export type { RobustNoise } from "./models/robust-noise.js";
export { buildModel, modelLikelihood, modelParameterNames, MODEL_NAMES, type ModelName, type LightCurveModel } from "./models/light-curve-model.js";
export { posteriorPredictive, type PredictiveCurve } from "./models/posterior-predictive.js";
export { carmaOrderGrid, compareModels, type ModelComparison } from "./models/compare-models.js";
export type { CarmaOrder } from "./models/carma-model.js";
export type { ModelName as FamilyModelName } from "./kernels/families.js";
export { summarizeLightCurve, type DataSummary } from "./models/data-summary.js";
export { HOROLOGIUM_VERSION } from "./version.js";
