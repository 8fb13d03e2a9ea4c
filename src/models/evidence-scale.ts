/** One side of a Bayes factor: a model's label and its ln evidence with the estimate's standard error. */
export interface EvidenceSide {
  readonly label: string;
  readonly logEvidence: number;
  /** Monte Carlo standard error of the ln evidence; null when the estimator states none (Laplace). */
  readonly standardError: number | null;
}

/** How strongly the evidence prefers one model over another. */
export interface EvidencePreference {
  readonly preferred: string;
  readonly over: string;
  /** ln B = ln Z(preferred) - ln Z(over), at least 0. */
  readonly logBayesFactor: number;
  /**
   * Standard error of ln B: sqrt(se1^2 + se2^2), the two estimates coming from independent draws; null when
   * either evidence is a Laplace approximation (its error is not estimated).
   */
  readonly standardError: number | null;
  /** 2 ln B, the quantity the scale is read on. */
  readonly twoLogBayesFactor: number;
  /** The word for 2 ln B on the scale (see `strengthOfEvidence`). */
  readonly strength: EvidenceStrength;
  /** Words of the scale that 2 ln B +- 2 standard errors reaches (one entry when the error cannot change the reading). */
  readonly strengthRange: readonly EvidenceStrength[];
  /** The scale's source and its bands, in words. */
  readonly scale: string;
  /** The preference in one sentence, as the console prints it. */
  readonly sentence: string;
}

/** Words of the scale, weakest first. */
export type EvidenceStrength = "inconclusive" | "moderate" | "clear" | "overwhelming";

/**
 * The bands of Kass & Raftery 1995 (JASA 90, 773, sec. 3.2) on 2 ln B, with the project's own words:
 * below 2 the data hardly separate the models ("inconclusive"); 2 to 6 they favour one, short of settling
 * it ("moderate"); 6 to 10 the favoured model is well ahead ("clear"); above 10 the other is out of the
 * running ("overwhelming").
 */
export const EVIDENCE_SCALE =
  "Kass & Raftery 1995 (JASA 90, 773) bands on 2 ln B: below 2 inconclusive, 2-6 moderate, 6-10 clear, above 10 overwhelming";

/** The word of the scale for 2 ln B ({@link EVIDENCE_SCALE}). */
export function strengthOfEvidence(twoLogBayesFactor: number): EvidenceStrength {
  return twoLogBayesFactor > 10 ? "overwhelming" : twoLogBayesFactor > 6 ? "clear" : twoLogBayesFactor > 2 ? "moderate" : "inconclusive";
}

const STRENGTHS: readonly EvidenceStrength[] = ["inconclusive", "moderate", "clear", "overwhelming"];

/** 2 ln B as text, with its standard error when there is one: "6.4 +- 0.3". */
export function twoLogBayesFactorText(preference: EvidencePreference): string {
  const twice = preference.twoLogBayesFactor.toFixed(1);
  return preference.standardError === null ? twice : `${twice} ± ${(2 * preference.standardError).toFixed(1)}`;
}

/**
 * The Bayes factor of `a` over `b` (or of `b` over `a`, whichever has the larger evidence), its standard
 * error and its reading on the Kass & Raftery scale, including the words 2 ln B reaches within two
 * standard errors.
 */
export function bayesFactorPreference(a: EvidenceSide, b: EvidenceSide): EvidencePreference {
  const [preferred, over] = a.logEvidence >= b.logEvidence ? [a, b] : [b, a];
  const logBayesFactor = preferred.logEvidence - over.logEvidence;
  const standardError = preferred.standardError === null || over.standardError === null ? null : Math.hypot(preferred.standardError, over.standardError);
  const twoLogBayesFactor = 2 * logBayesFactor;
  const strength = strengthOfEvidence(twoLogBayesFactor);
  const reach = standardError === null ? 0 : 4 * standardError;
  const low = STRENGTHS.indexOf(strengthOfEvidence(Math.max(0, twoLogBayesFactor - reach)));
  const high = STRENGTHS.indexOf(strengthOfEvidence(twoLogBayesFactor + reach));
  const strengthRange = STRENGTHS.slice(low, high + 1);
  const partial = { preferred: preferred.label, over: over.label, logBayesFactor, standardError, twoLogBayesFactor, strength, strengthRange, scale: EVIDENCE_SCALE };
  const lnB = standardError === null ? `ln B = ${logBayesFactor.toFixed(2)} (Laplace, error not estimated)` : `ln B = ${logBayesFactor.toFixed(2)} ± ${standardError.toFixed(2)}`;
  const range = strengthRange.length > 1 ? `; within two standard errors ${strengthRange[0]} to ${strengthRange[strengthRange.length - 1]}` : "";
  const sentence =
    `${preferred.label} over ${over.label}: ${lnB}, 2 ln B = ${twoLogBayesFactorText({ ...partial, sentence: "" })}, ` +
    `${strength} evidence on the Kass & Raftery 1995 scale${range}.`;
  return { ...partial, sentence };
}
