import { findMaximumPosterior, unconstrainedPosterior, startingPoints } from "../inference/index.js";
import type { LightCurve } from "../lightcurve/light-curve.js";
import { childSeed, createRng } from "../random/rng.js";
import { summarizeLightCurve } from "./data-summary.js";
import { laplaceLogEvidence } from "./laplace-evidence.js";
import { periodogramPeriod } from "./fit-period-search.js";
import { buildModel, modelLikelihood, type ModelName } from "./light-curve-model.js";
import { MAX_CARMA_ORDER, type CarmaOrder } from "./carma-model.js";
import { modelPeriodRange, periodRange, type PeriodLimits } from "./period-range.js";

/** One model's standing in a comparison. */
export interface ModelStanding {
  readonly model: ModelName;
  /** CARMA only: the order "p,q". */
  readonly order?: string;
  /** The model's name as shown: the model, or "carma(p,q)". */
  readonly label: string;
  /** Laplace-approximated ln evidence (marginal likelihood) of the model. */
  readonly logEvidence: number;
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
}

/**
 * Ranks Gaussian-process models of one light curve by their Bayesian evidence (marginal likelihood)
 * Z = integral L(theta) pi(theta) dtheta, in the Laplace approximation at the maximum a posteriori
 * (MacKay 2003, ch. 28). The evidence is the natural criterion for Gaussian processes: the likelihood
 * already integrates over the latent light curve, and the integral over the parameters penalises the extra
 * freedom of a periodic kernel, which the maximum likelihood alone would always reward. Differences are
 * read on the scale of Kass & Raftery 1995 (JASA 90, 773): 2 ln B above 6 is strong evidence, above 10
 * very strong. The BIC is reported beside it for reference.
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
    const best = findMaximumPosterior(target, { starts });
    const evidence = laplaceLogEvidence(target, best.x);
    const physical = model.space.toPhysical(best.x);
    const logLikelihood = likelihood.logLikelihood(physical);
    const k2 = model.space.dimension;
    return {
      model: name,
      ...(order ? { order: `${order.p},${order.q}` } : {}),
      label: order ? `carma(${order.p},${order.q})` : name,
      logEvidence: evidence.logEvidence,
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
  return {
    criterion: "Laplace-approximated Bayesian evidence (marginal likelihood); Kass & Raftery 1995 scale",
    ranking,
    verdict: verdictOf(ranking),
  };
}

/** An oscillator with Q <= 1/2 at its maximum is overdamped: it has no oscillation, so no period. */
function oscillates(standing: ModelStanding): boolean {
  return standing.model === "quasi-periodic" || (standing.model === "oscillator" && standing.maximum.quality > 0.5);
}

/** Kass & Raftery 1995's words for 2 ln B. */
function strengthOf(twoLnB: number): string {
  return twoLnB > 10 ? "very strong" : twoLnB > 6 ? "strong" : twoLnB > 2 ? "positive" : "not worth more than a bare mention";
}

/** Every CARMA order (p, q) with 1 <= p <= MAX_CARMA_ORDER and q < p: the grid `compare` searches. */
export function carmaOrderGrid(): CarmaOrder[] {
  const grid: CarmaOrder[] = [];
  for (let p = 1; p <= MAX_CARMA_ORDER; p++) for (let q = 0; q < p; q++) grid.push({ p, q });
  return grid;
}

/** Which CARMA order the evidence prefers, and over the runner-up by how much. */
function carmaVerdict(ranking: readonly ModelStanding[]): string {
  const orders = ranking.filter((s) => s.model === "carma");
  if (orders.length < 2) return "";
  const twoLnB = 2 * (orders[0].logEvidence - orders[1].logEvidence);
  return ` CARMA order: ${orders[0].label} over ${orders[1].label}, 2 ln B = ${twoLnB.toFixed(1)} (${strengthOf(twoLnB)} evidence).`;
}

function verdictOf(ranking: readonly ModelStanding[]): string {
  return periodVerdict(ranking) + carmaVerdict(ranking);
}

function periodVerdict(ranking: readonly ModelStanding[]): string {
  const best = ranking[0];
  const aperiodic = ranking.find((s) => !oscillates(s));
  const periodic = ranking.find(oscillates);
  const strength = strengthOf;
  if (!aperiodic || !periodic) return `${best.label} is preferred.`;
  const twoLnB = 2 * Math.abs(periodic.logEvidence - aperiodic.logEvidence);
  if (!oscillates(best)) return `No period: an aperiodic model (${best.label}) is preferred (2 ln B = ${twoLnB.toFixed(1)}, ${strength(twoLnB)} evidence).`;
  const period = best.maximum.period;
  return `A period is supported: ${best.model} (period ${period.toPrecision(4)}) over the damped random walk, 2 ln B = ${twoLnB.toFixed(1)} (${strength(twoLnB)} evidence).`;
}
