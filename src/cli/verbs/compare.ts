import { compareModels, type ModelStanding } from "../../models/compare-models.js";
import { MODEL_NAMES, type ModelName } from "../../models/light-curve-model.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { FIT_OPTIONS, fitArguments, modelName } from "../fit-arguments.js";
import { readInput } from "../read-input.js";
import { COLUMN_HELP, COLUMN_OPTIONS, OUTPUT_OPTIONS, textOption, withSingleInput } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";

/** Models compared when --models is not given: every model but CARMA (only when asked: its grid is ten fits). */
const DEFAULT_COMPARED: readonly ModelName[] = MODEL_NAMES.filter((name) => name !== "carma");

const HELP = `Usage: horologium compare FILE [--models ${DEFAULT_COMPARED.join(",")}] [options]

Fits several models to one light curve and ranks them by their Bayesian evidence (the marginal
likelihood, by importance sampling from Student-t components at the optima found; where the draws'
k-hat stays too high, by bridge sampling from MCMC draws of that model; either with its Monte Carlo
standard error, the "by" column naming the estimator): the criterion
suited to Gaussian processes, whose likelihood already integrates over the latent light curve, and
which charges a periodic kernel for its extra freedom where the best-fit likelihood alone would
always prefer it. It answers "is there a period at all?" and says how strongly: the log Bayes
factor ln B of the best model over the runner-up with its standard error, read on the bands of
Kass & Raftery 1995 (JASA 90, 773) for 2 ln B: below 2 inconclusive, 2-6 moderate, 6-10 clear,
above 10 overwhelming. The BIC is shown beside it. The JSON (--out) holds the same under
"preference" (and "carmaOrder" for CARMA orders).

Options:
  --models LIST           comma-separated models (default ${DEFAULT_COMPARED.join(",")}); "carma"
                          compares every CARMA order p,q with q < p <= 4 (Kelly et al. 2014) and says
                          which order the evidence prefers and how strongly
  --background drw        add a damped-random-walk background to every model
  --seed N                seed of the optimiser's random starts (default 1)
  --min-period P, --max-period P   the period range of the periodic models (as for fit)
  --out FILE              write the comparison as JSON here (one object; for a file with several
                          bands each band is compared on its own: {"perBand": {"<band>": ...}},
                          --band NAME for one)
  --quiet                 do not print the table
${COLUMN_HELP}

Example:
  horologium compare demo/lds-v2291-spotted-star.csv --out comparison.json
`;

const OPTIONS = {
  ...COLUMN_OPTIONS,
  ...OUTPUT_OPTIONS,
  models: { type: "string" },
  background: FIT_OPTIONS.background,
  seed: FIT_OPTIONS.seed,
  "min-period": FIT_OPTIONS["min-period"],
  "max-period": FIT_OPTIONS["max-period"],
} as const;

/** The Monte Carlo standard error of a model's ln Z, or "none" when it is the Laplace approximation. */
function evidenceErrorText(standing: ModelStanding): string {
  return standing.logEvidenceError === null ? "none" : standing.logEvidenceError.toFixed(2);
}

/** `horologium compare`. */
export const verb: CliVerb = {
  summary: "rank models by Bayesian evidence: is there a period at all?",
  run: withSingleInput(OPTIONS, HELP, async ({ values, file, quiet }, io: CliIo) => {
    const models = (textOption(values, "models") ?? DEFAULT_COMPARED.join(",")).split(",").map((m) => modelName(m.trim(), "--models"));
    const { seed, background, minimumPeriod, maximumPeriod } = fitArguments(values, false);
    const periodLimits = { ...(minimumPeriod !== undefined ? { minimumPeriod } : {}), ...(maximumPeriod !== undefined ? { maximumPeriod } : {}) };
    const lightCurves = await readInput(file, values, io, quiet);
    const comparisons = lightCurves.map((lightCurve) => ({
      ...(lightCurve.band !== undefined ? { band: lightCurve.band } : {}),
      ...compareModels(lightCurve, models, { seed, periodLimits, ...(background ? { background } : {}) }),
    }));
    if (!quiet) {
      for (const comparison of comparisons) {
        io.stdout(`${file}${comparison.band ? ` [band ${comparison.band}]` : ""} — ${comparison.criterion}\n`);
        io.stdout(`  ${"model".padEnd(16)} ${"ln Z".padStart(11)} ${"± s.e.".padStart(8)} ${"by".padStart(11)} ${"delta".padStart(8)} ${"prob".padStart(7)} ${"ln L".padStart(11)} ${"BIC".padStart(11)}\n`);
        for (const s of comparison.ranking)
          io.stdout(
            `  ${s.label.padEnd(16)} ${s.logEvidence.toFixed(2).padStart(11)} ${evidenceErrorText(s).padStart(8)} ${s.evidenceMethod.padStart(11)} ${s.deltaLogEvidence.toFixed(2).padStart(8)} ${s.probability.toFixed(3).padStart(7)} ${s.logLikelihood.toFixed(2).padStart(11)} ${s.bic.toFixed(2).padStart(11)}\n`,
          );
        io.stdout(`  ${comparison.verdict}\n`);
        // How strongly, unless the verdict already said it in the same words (a comparison of CARMA orders alone).
        const preference = comparison.preference;
        if (preference && !comparison.verdict.includes(preference.sentence)) io.stdout(`  How strongly: ${preference.sentence}\n`);
        // Every evidence not by importance sampling, with the reason (the JSON holds it for every model: evidenceDetail).
        for (const s of comparison.ranking.filter((standing) => standing.evidenceMethod !== "importance"))
          io.stdout(`  ${s.label}: ${s.evidenceDetail}\n`);
      }
    }
    const out = textOption(values, "out");
    // One JSON object in every case: per band, by band name, for a multi-band file.
    const json = comparisons.length === 1 ? comparisons[0] : { perBand: Object.fromEntries(comparisons.map((c) => [c.band ?? "", c])) };
    if (out !== undefined) writeOutput(JSON.stringify(json, null, 2) + "\n", out, io);
    return 0;
  }),
};
