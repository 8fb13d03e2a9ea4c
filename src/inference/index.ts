/**
 * The inference layer: parameters with priors and transforms, maximum a posteriori, the ensemble and
 * no-U-turn samplers, convergence diagnostics and posterior summaries. Works on any {@link PosteriorTarget},
 * so it does not depend on the Gaussian-process engine.
 */
export type { PosteriorTarget, DifferentiablePosteriorTarget } from "./posterior-target.js";
export { hasGradient } from "./posterior-target.js";
export { countEvaluations, evaluationCost, type CountedPosteriorTarget, type EvaluationCounts } from "./evaluation-counter.js";
export { DEFAULT_GRADIENT_COST } from "./gradient-cost.js";
export {
  uniformPrior,
  logUniformPrior,
  normalPrior,
  halfNormalPrior,
  logNormalPrior,
  truncatedPrior,
  type Prior,
} from "./priors.js";
export {
  identityTransform,
  lowerBoundTransform,
  upperBoundTransform,
  intervalTransform,
  transformForSupport,
  type Transform,
} from "./transforms.js";
export {
  createParameterSpace,
  withFixedParameters,
  withFreeParameter,
  type ParameterSpace,
  type ParameterSpec,
  type FreeParameter,
} from "./parameter-space.js";
export { unconstrainedPosterior, type PhysicalLikelihood, type UnconstrainedPosteriorOptions } from "./unconstrained-posterior.js";
export { minimizeLbfgs, type MinimizationStop, type LbfgsOptions, type LocalMinimum, type GradientObjective } from "./lbfgs.js";
export { minimizeNelderMead, type NelderMeadOptions } from "./nelder-mead.js";
export { findMaximumPosterior, NoFiniteStartError, startingPoints, type MaximumPosteriorOptions, type MaximumPosterior, type LocalMaximum } from "./maximum-posterior.js";
export { modeScales } from "./mode-curvature.js";
export { stretchProposal, differentialEvolutionProposal, defaultWalkerProposals, type WalkerProposal, type WeightedProposal } from "./walker-proposals.js";
export { createWalkerEnsemble, defaultWalkerCount, type WalkerEnsembleOptions } from "./walker-ensemble.js";
export { createNutsSampler, type NutsSamplerOptions } from "./nuts-sampler.js";
export type { MarkovSampler } from "./markov-sampler.js";
export { ChainTraceRecorder, MAX_TRACE_STEPS, MAX_TRACED_CHAINS, type ChainTrace, type TraceSeries } from "./chain-trace.js";
export { DrawStore } from "./draw-store.js";
export {
  runSampler,
  type RunSamplerOptions,
  type SamplerRun,
  type SamplerProgress,
  type StopReason,
  type CancellationSignal,
  type RunDiagnostics,
} from "./run-sampler.js";
export {
  assessConvergence,
  rhatThreshold,
  DEFAULT_CONVERGENCE_CRITERIA,
  type ConvergenceCriteria,
  type ConvergenceReport,
  type ParameterDiagnostics,
} from "./convergence-check.js";
export {
  autocovariance,
  averagedAutocorrelation,
  integratedAutocorrelationTime,
  chainsAutocorrelationTime,
  type AutocorrelationTime,
} from "./autocorrelation.js";
export { rankNormalize, splitChains, foldAboutMedian } from "./rank-normalization.js";
export { rankNormalizedSplitRhat, potentialScaleReduction } from "./split-rhat.js";
export { effectiveSampleSize, bulkEffectiveSampleSize, tailEffectiveSampleSize } from "./effective-sample-size.js";
export { highestDensityInterval } from "./highest-density-interval.js";
export { summarizeDraws, type PosteriorSummary, type ParameterSummary } from "./posterior-summary.js";
export type { SamplerDiagnostics } from "./sampler-diagnostics.js";
export { posteriorDraws, posteriorDrawsToCsv, type PosteriorDraws } from "./posterior-draws.js";
export {
  samplePosterior,
  DEFAULT_SAMPLER,
  type SamplerKind,
  type PosteriorSamplingOptions,
  type PosteriorSample,
} from "./sample-posterior.js";
export { planWarmup, type WarmupPlan } from "./warmup-schedule.js";
export { checkGrowthAfter } from "./check-schedule.js";
export {
  posteriorByMethod,
  markovPosterior,
  IMPORTANCE_MAX_DIMENSION,
  type PosteriorMethod,
  type MethodPosterior,
  type MethodPosteriorOptions,
  type MethodDiagnostics,
} from "./posterior-by-method.js";
export { modeMixturePosterior, type ModeMixtureAttempt, type ModeMixturePosteriorOptions } from "./mode-mixture-posterior.js";
export { modeMixtureSample, type ModeMixtureOptions, type ModeMixtureSample } from "./mode-mixture-sampling.js";
export { importanceSample, type ImportanceSample, type ImportanceSamplingOptions, type ImportanceRound } from "./importance-sampling.js";
export { paretoSmoothedWeights, paretoShapeThreshold, type SmoothedWeights } from "./pareto-smoothed-weights.js";
export { fitGeneralizedPareto, generalizedParetoQuantile } from "./generalized-pareto-fit.js";
export { studentTProposal, type StudentTProposal } from "./student-t-proposal.js";
export { profileProposal, type ImportanceProposal, type ProfileGrid, type ProfileProposalOptions } from "./profile-proposal.js";
export { modeCovariance } from "./mode-covariance.js";
export { systematicResample } from "./weighted-resampling.js";
