import {
  defaultWalkerCount,
  findMaximumPosterior,
  unconstrainedPosterior,
  startingPoints,
  type MaximumPosterior,
  type ParameterSpace,
  type PhysicalLikelihood,
  type PosteriorTarget,
} from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { childSeed, createRng, type Rng } from "../random/rng.js";
import { summarizeLightCurve } from "./data-summary.js";
import { bayesFactorPreference, twoLogBayesFactorText, type EvidencePreference } from "./evidence-scale.js";
import { importanceLogEvidence, type ImportanceEvidence } from "./importance-evidence.js";
import { markovBridgeEvidence } from "./mcmc-evidence.js";
import { startsFromDraws } from "../inference/posterior-by-method.js";
import { laplaceLogEvidence } from "./laplace-evidence.js";
import { periodogramPeriod } from "./fit-period-search.js";
import { buildModel, modelLikelihood, type ModelName } from "./light-curve-model.js";
import { carmaSymmetries, MAX_CARMA_ORDER, type CarmaOrder } from "./carma-model.js";
import { modelPeriodRange, periodRange, type PeriodLimits } from "./period-range.js";
import { explainingUnfittable } from "./fit-data-support.js";

/** One model's standing in a comparison. */
export interface ModelStanding {
  readonly model: ModelName;
  /** CARMA only: the order "p,q". */
  readonly order?: string;
  /** The model's name as shown: the model, or "carma(p,q)". */
  readonly label: string;
  /**
   * ln evidence (marginal likelihood) of the model: by importance sampling at its modes
   * (`importanceLogEvidence`) when its diagnostic holds, else by bridge sampling from MCMC draws
   * (`markovBridgeEvidence`), else the Laplace approximation.
   */
  readonly logEvidence: number;
  /** Monte Carlo standard error of `logEvidence`; null for the Laplace approximation (no stated error). */
  readonly logEvidenceError: number | null;
  /** How `logEvidence` was estimated. */
  readonly evidenceMethod: "importance" | "bridge" | "laplace";
  /** The estimator in words: its draws, modes, k-hat, and why a later estimator was needed. */
  readonly evidenceDetail: string;
  /** k-hat of the importance ratios (null when no draws were made). */
  readonly evidenceParetoShape: number | null;
  /** The Laplace approximation at the same mode, for reference. */
  readonly laplaceLogEvidence: number;
  /** ln L at the maximum a posteriori. */
  readonly logLikelihood: number;
  /** Bayesian information criterion k ln N - 2 ln L (lower is better), for reference. */
  readonly bic: number;
  readonly parameterCount: number;
  /** ln Z of this model minus ln Z of the best one (0 for the best). */
  readonly deltaLogEvidence: number;
  /** Posterior probability of the model among those compared, with equal prior odds. */
  readonly probability: number;
  /** The maximum a posteriori, by parameter name. */
  readonly maximum: Readonly<Record<string, number>>;
}

/** The outcome of {@link compareModels}. */
export interface ModelComparison {
  readonly criterion: string;
  /** Best first. */
  readonly ranking: readonly ModelStanding[];
  /** A plain-language verdict, for example whether there is a period at all. */
  readonly verdict: string;
  /** How strongly the evidence prefers the best model over the runner-up (absent for one model). */
  readonly preference?: EvidencePreference;
  /** CARMA orders compared: how strongly the evidence prefers the best order over the next best. */
  readonly carmaOrder?: EvidencePreference;
}

/**
 * Ranks Gaussian-process models of one light curve by their Bayesian evidence (marginal likelihood)
 * Z = integral L(theta) pi(theta) dtheta, estimated by importance sampling from Student-t components at
 * the local maxima the optimiser's starts reached (`importanceLogEvidence`: unbiased, with a Monte Carlo
 * standard error); where the importance ratios' k-hat says that estimate cannot be trusted, by bridge
 * sampling from the walker ensemble's draws of the posterior (`markovBridgeEvidence`, with its standard
 * error); the Laplace approximation (MacKay 2003, ch. 28) only where neither gives an estimate. Each
 * standing says which (`evidenceMethod`, `evidenceDetail`). The evidence is the natural criterion for Gaussian
 * processes: the likelihood already integrates over the latent light curve, and the integral over the parameters penalises the extra
 * freedom of a periodic kernel, which the maximum likelihood alone would always reward. Differences are
 * read on the scale of Kass & Raftery 1995 (JASA 90, 773; `bayesFactorPreference`), with the
 * standard error of ln B. The BIC is reported beside it for reference.
 */
export function compareModels(
  lightCurve: LightCurve,
  models: readonly ModelName[],
  options: {
    readonly seed: number | string;
    readonly background?: "drw";
    readonly starts?: number;
    readonly periodLimits?: PeriodLimits;
    /** The CARMA orders compared when `models` holds "carma" (default {@link carmaOrderGrid}). */
    readonly carmaOrders?: readonly CarmaOrder[];
  },
): ModelComparison {
  const summary = summarizeLightCurve(lightCurve);
  const source = lightCurve.provenance.source;
  const limits = options.periodLimits ?? {};
  const searched = models.some((name) => name !== "drw") ? periodRange(summary, 2, limits, source) : undefined;
  const periodGuess = searched ? periodogramPeriod(lightCurve, searched) : undefined;
  const candidates = models.flatMap((name): { name: ModelName; order: CarmaOrder | undefined }[] =>
    name === "carma" ? (options.carmaOrders ?? carmaOrderGrid()).map((order) => ({ name, order })) : [{ name, order: undefined }],
  );
  const standings = candidates.map(({ name, order }, k) => {
    const range = modelPeriodRange(name, summary, limits, source);
    const model = buildModel(name, summary, {
      ...(order ? { order } : {}),
      ...(options.background ? { background: options.background } : {}),
      ...(periodGuess !== undefined ? { periodGuess } : {}),
      ...(range ? { periodRange: range } : {}),
    });
    const likelihood = modelLikelihood(model, lightCurve);
    const target = unconstrainedPosterior(model.space, likelihood, { jacobian: true });
    const rng = createRng(childSeed(options.seed, k));
    const starts = startingPoints(model.space, options.starts ?? 6, rng, model.initialGuess);
    if (model.initialGuess.period !== undefined) {
      for (const factor of [0.5, 2]) {
        const period = model.initialGuess.period * factor;
        const prior = model.space.free.find((p) => p.name === "period")!.prior;
        if (period > prior.lower && period < prior.upper)
          starts.push(model.space.toUnconstrained(model.space.physicalFromRecord({ ...model.initialGuess, period })));
      }
    }
    const best = explainingUnfittable(lightCurve, summary, name, () => findMaximumPosterior(target, { starts }));
    const laplace = laplaceLogEvidence(target, best.x);
    const symmetries = order ? carmaSymmetries(order, model.space.free.map((p) => p.name)) : [];
    // Every local maximum the starts reached within ln p 10 of the best: the proposal gets a component at each.
    const modes = best.runs.filter((run) => run.logPosterior > best.logPosterior - 10).map((run) => run.x);
    const evidence = evidenceAt({ space: model.space, likelihood, target, maximum: best }, modes, rng, `${childSeed(options.seed, k)}:bridge`, symmetries, laplace.logEvidence);
    const physical = model.space.toPhysical(best.x);
    const logLikelihood = likelihood.logLikelihood(physical);
    const k2 = model.space.dimension;
    return {
      model: name,
      ...(order ? { order: `${order.p},${order.q}` } : {}),
      label: order ? `carma(${order.p},${order.q})` : name,
      ...evidence,
      laplaceLogEvidence: laplace.logEvidence,
      logLikelihood,
      bic: k2 * Math.log(summary.n) - 2 * logLikelihood,
      parameterCount: k2,
      maximum: model.space.recordFromPhysical(physical),
    };
  });
  const top = standings.reduce((best, s) => Math.max(best, s.logEvidence), -Infinity);
  const total = standings.reduce((sum, s) => sum + Math.exp(s.logEvidence - top), 0);
  const ranking = standings
    .map((s) => ({ ...s, deltaLogEvidence: s.logEvidence - top, probability: Math.exp(s.logEvidence - top) / total }))
    .sort((a, b) => b.logEvidence - a.logEvidence);
  const orders = ranking.filter((s) => s.model === "carma");
  const preference = ranking.length >= 2 ? preferenceOf(ranking) : undefined;
  const carmaOrder = orders.length >= 2 ? preferenceOf(orders) : undefined;
  return {
    criterion: "Bayesian evidence (marginal likelihood) by importance sampling at the modes, or bridge sampling from MCMC draws where that fails; Kass & Raftery 1995 scale",
    ranking,
    verdict: verdictOf(ranking, carmaOrder),
    ...(preference ? { preference } : {}),
    ...(carmaOrder ? { carmaOrder } : {}),
  };
}

/** The first of `standings` (best first) over the second. */
function preferenceOf(standings: readonly ModelStanding[]): EvidencePreference {
  const [best, second] = standings as [ModelStanding, ModelStanding];
  return bayesFactorPreference(
    { label: best.label, logEvidence: best.logEvidence, standardError: best.logEvidenceError },
    { label: second.label, logEvidence: second.logEvidence, standardError: second.logEvidenceError },
  );
}

/**
 * The evidence of one model: importance sampling from t components at its modes; where k-hat stays above
 * its threshold, bridge sampling from the walker ensemble's draws of the posterior; the Laplace value
 * (no stated error) only when neither gives an estimate.
 */
function evidenceAt(
  problem: { space: ParameterSpace; likelihood: PhysicalLikelihood; target: PosteriorTarget; maximum: MaximumPosterior },
  modes: readonly Float64Array[],
  rng: Rng,
  seed: string,
  symmetries: readonly (readonly number[])[],
  laplace: number,
): Pick<ModelStanding, "logEvidence" | "logEvidenceError" | "evidenceMethod" | "evidenceParetoShape" | "evidenceDetail"> {
  const estimate: ImportanceEvidence | undefined = importanceLogEvidence(problem.target, modes, rng, { symmetries });
  const paretoShape = estimate ? estimate.paretoShape : null;
  const shapeText = paretoShape === null ? "no positive-definite curvature at any mode" : `k-hat ${paretoShape.toFixed(2)}`;
  if (estimate && estimate.reliable && Number.isFinite(estimate.logEvidence)) {
    const modeText = estimate.modes > 1 ? `, ${estimate.modes} modes` : "";
    return {
      logEvidence: estimate.logEvidence,
      logEvidenceError: estimate.standardError,
      evidenceMethod: "importance",
      evidenceParetoShape: paretoShape,
      evidenceDetail: `importance sampling: ${estimate.draws} draws${modeText}, ${shapeText}`,
    };
  }
  // The walkers start at the failed importance sample's draws resampled by weight (over every mode it found), unless its weights sit on a few draws.
  const startPoints = estimate ? startsFromDraws(estimate.sample, defaultWalkerCount(problem.space.dimension), rng) : undefined;
  const bridge = markovBridgeEvidence(problem.space, problem.likelihood, problem.target, problem.maximum, rng, { seed, symmetries, ...(startPoints ? { startPoints } : {}) });
  if (bridge && Number.isFinite(bridge.logEvidence) && Number.isFinite(bridge.standardError)) {
    return {
      logEvidence: bridge.logEvidence,
      logEvidenceError: bridge.standardError,
      evidenceMethod: "bridge",
      evidenceParetoShape: paretoShape,
      evidenceDetail:
        `bridge sampling: ${bridge.posteriorDraws} posterior draws (ESS ${Math.round(bridge.posteriorEss)}; chains ${bridge.chainsConverged ? "converged" : "not converged"}), ` +
        `${bridge.proposalDraws} proposal draws; importance sampling failed (${shapeText})`,
    };
  }
  return {
    logEvidence: laplace,
    logEvidenceError: null,
    evidenceMethod: "laplace",
    evidenceParetoShape: paretoShape,
    evidenceDetail: `Laplace approximation, error not estimated: importance sampling failed (${shapeText}) and bridge sampling gave no estimate`,
  };
}

/** An oscillator with Q <= 1/2 at its maximum is overdamped: it has no oscillation, so no period. */
function oscillates(standing: ModelStanding): boolean {
  return standing.model === "quasi-periodic" || (standing.model === "oscillator" && standing.maximum.quality > 0.5);
}

/** Every CARMA order (p, q) with 1 <= p <= MAX_CARMA_ORDER and q < p: the grid `compare` searches. */
export function carmaOrderGrid(): CarmaOrder[] {
  const grid: CarmaOrder[] = [];
  for (let p = 1; p <= MAX_CARMA_ORDER; p++) for (let q = 0; q < p; q++) grid.push({ p, q });
  return grid;
}

/** Which CARMA order the evidence prefers, and over the runner-up by how much. */
function carmaVerdict(carmaOrder: EvidencePreference | undefined): string {
  return carmaOrder ? ` CARMA order: ${carmaOrder.sentence}` : "";
}

function verdictOf(ranking: readonly ModelStanding[], carmaOrder: EvidencePreference | undefined): string {
  return periodVerdict(ranking) + carmaVerdict(carmaOrder);
}

function periodVerdict(ranking: readonly ModelStanding[]): string {
  const best = ranking[0];
  const aperiodic = ranking.find((s) => !oscillates(s));
  const periodic = ranking.find(oscillates);
  if (!best) return "";
  if (!aperiodic || !periodic) return `${best.label} is preferred.`;
  const [winner, loser] = oscillates(best) ? [periodic, aperiodic] : [aperiodic, periodic];
  const preference = bayesFactorPreference(
    { label: winner.label, logEvidence: winner.logEvidence, standardError: winner.logEvidenceError },
    { label: loser.label, logEvidence: loser.logEvidence, standardError: loser.logEvidenceError },
  );
  const strength = `2 ln B = ${twoLogBayesFactorText(preference)}, ${preference.strength} evidence`;
  if (!oscillates(best)) return `No period: an aperiodic model (${best.label}) is preferred (${strength}).`;
  const period = best.maximum.period;
  return `A period is supported: ${best.model} (period ${period.toPrecision(4)}) over the damped random walk (${strength}).`;
}
