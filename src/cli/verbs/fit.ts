import { resolve } from "node:path";
import type { LightCurve } from "../../lightcurve/light-curve.js";
import { InputError } from "../../errors/input-error.js";
import { DEFAULT_SAMPLER } from "../../inference/index.js";
import { fitLightCurveDetailed } from "../../models/fit-light-curve.js";
import type { FitOptions } from "../../models/fit-options.js";
import type { FitResult } from "../../models/fit-result.js";
import { MODEL_NAMES, type ModelName } from "../../models/light-curve-model.js";
import { jointReportInput } from "../../report/joint-report-input.js";
import { reportInputFromFit } from "../../report/report-from-fit.js";
import { writeReport } from "../../report/write-report.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";
import { fitSummaryText } from "../fit-summary-text.js";
import { samplerProgressBar } from "../progress-bar.js";
import { readInput } from "../read-input.js";
import {
  COLUMN_HELP,
  COLUMN_OPTIONS,
  numberOption,
  parseVerbArguments,
  PERIOD_HELP,
  PERIOD_OPTIONS,
  periodLimitsFrom,
  seedOption,
  singleInput,
  textOption,
  type VerbArguments,
} from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";
import { BAND_HELP, BAND_OPTIONS, bandChoice } from "../band-choice.js";
import { fitJointWithProgress, perBandResults } from "../fit-bands.js";

const HELP = `Usage: horologium fit FILE --model drw|oscillator|quasi-periodic [options]

Fits a Gaussian-process model to a light curve (CSV/TSV, Parquet or FITS binary table) and writes
the result as JSON: posterior summaries of every parameter, derived quantities, sampler
diagnostics and warnings about what the data do not constrain.

Options:
  --model NAME            drw (quasar timescale), oscillator, quasi-periodic (stellar rotation)
  --background drw        add a slow damped random walk for trends
  --seed N                seed of every random choice (default 1): same seed, same result
  --out FILE              write the JSON here (default: standard output)
  --report DIR            also write an HTML report with figures to DIR
  --redshift Z            report the rest-frame timescale tau / (1 + Z) (drw)
  --jitter                fit a white-noise term even when there is an error column
  --robust                Student-t noise: down-weights outliers and reports each point's outlier
                          probability (needs an error column)
  --sampler nuts|ensemble the sampler (default ${DEFAULT_SAMPLER}, the one bench/samplers-compare.ts measured cheaper)
  --max-evaluations N     budget in log-likelihood evaluations (default 2e6)
${PERIOD_HELP}
  --quiet                 no progress bar, no summary on stderr
${COLUMN_HELP}
${BAND_HELP}

Example (an invented quasar of the Lanternfield Deep Survey):
  horologium fit lds-quasar.csv --model drw --redshift 1.9 --seed 7 --out quasar.json --report quasar-report
  horologium fit lds-quasar-ugrizy.csv --model drw --lags --out joint.json
`;

const OPTIONS = {
  ...COLUMN_OPTIONS,
  ...PERIOD_OPTIONS,
  ...BAND_OPTIONS,
  model: { type: "string" },
  background: { type: "string" },
  seed: { type: "string" },
  out: { type: "string" },
  report: { type: "string" },
  redshift: { type: "string" },
  jitter: { type: "boolean" },
  robust: { type: "boolean" },
  sampler: { type: "string" },
  "max-evaluations": { type: "string" },
  quiet: { type: "boolean" },
} as const;

/** Fit options from the command line (shared by fit, predict and compare). */
export function fitOptionsFrom(values: VerbArguments["values"], required = true): Omit<FitOptions, "model"> & { model?: ModelName } {
  const model = textOption(values, "model");
  if (model === undefined && required) throw new UsageError(`--model is required (${MODEL_NAMES.join(", ")})`);
  if (model !== undefined && !MODEL_NAMES.includes(model as ModelName))
    throw new UsageError(`--model must be one of ${MODEL_NAMES.join(", ")}, got "${model}"`);
  const background = textOption(values, "background");
  if (background !== undefined && background !== "drw") throw new UsageError(`--background must be drw, got "${background}"`);
  const sampler = textOption(values, "sampler");
  if (sampler !== undefined && sampler !== "nuts" && sampler !== "ensemble")
    throw new UsageError(`--sampler must be nuts or ensemble, got "${sampler}"`);
  const redshift = numberOption(values, "redshift");
  if (redshift !== undefined && !(redshift >= 0)) throw new UsageError(`--redshift must be >= 0, got ${redshift}`);
  const maxEvaluations = numberOption(values, "max-evaluations");
  if (maxEvaluations !== undefined && !(maxEvaluations > 0)) throw new UsageError(`--max-evaluations must be > 0, got ${maxEvaluations}`);
  return {
    ...(model !== undefined ? { model: model as ModelName } : {}),
    seed: seedOption(values),
    ...(background ? { background: "drw" as const } : {}),
    ...(values.jitter ? { jitter: true } : {}),
    ...(values.robust ? { robust: true } : {}),
    ...(redshift !== undefined ? { redshift } : {}),
    ...(sampler ? { sampler: sampler as "nuts" | "ensemble" } : {}),
    ...(maxEvaluations !== undefined ? { maxEvaluations } : {}),
    ...periodLimitsFrom(values),
  };
}

/** Fits every light curve of the input (one per band) with a progress bar and the summary on stderr. */
export async function fitAll(
  lightCurves: readonly LightCurve[],
  options: FitOptions,
  io: CliIo,
  quiet: boolean,
  onFitted?: (lightCurve: LightCurve, fit: ReturnType<typeof fitLightCurveDetailed>) => Promise<void>,
): Promise<FitResult[]> {
  const results: FitResult[] = [];
  for (const lightCurve of lightCurves) {
    const label = lightCurve.band ? `fitting band ${lightCurve.band}` : "fitting";
    const bar = samplerProgressBar(io, quiet, label);
    let fit;
    try {
      fit = fitLightCurveDetailed(lightCurve, { ...options, ...(bar.onProgress ? { onProgress: bar.onProgress } : {}), clock: io.now });
    } finally {
      bar.stop();
    }
    if (!quiet) io.stderr(fitSummaryText(fit.result));
    if (onFitted) await onFitted(lightCurve, fit);
    results.push(fit.result);
  }
  return results;
}

/** `horologium fit`. */
export const verb: CliVerb = {
  summary: "fit a model to a light curve: posterior summaries, diagnostics, warnings (JSON)",
  async run(args: string[], io: CliIo): Promise<number> {
    const parsed = parseVerbArguments(args, OPTIONS, HELP, io.stdout);
    if (!parsed) return 0;
    const { values, positionals } = parsed;
    const file = singleInput(positionals);
    const options = fitOptionsFrom(values) as FitOptions;
    const quiet = values.quiet === true;
    const lightCurves = await readInput(file, values, io, quiet);
    if (options.robust) {
      const without = lightCurves.find((lc) => !lc.error);
      if (without) throw new InputError("--robust needs an error column (the Student-t noise scales each point's error)", { file });
    }
    const reportDir = textOption(values, "report");
    const choice = bandChoice(values, lightCurves);
    let json: string;
    if (choice.kind === "joint") {
      const fit = fitJointWithProgress(lightCurves, options, choice, io, quiet);
      if (reportDir) {
        const written = await writeReport(jointReportInput(fit), resolve(io.cwd, reportDir));
        if (!quiet) io.stderr(`report: ${written.html}\n`);
      }
      json = JSON.stringify(fit.result, null, 2) + "\n";
    } else {
      const results = await fitAll(lightCurves, options, io, quiet, async (lightCurve, fit) => {
        if (!reportDir) return;
        const dir = resolve(io.cwd, reportDir, lightCurves.length > 1 ? `band-${lightCurve.band}` : ".");
        const written = await writeReport(reportInputFromFit(fit.conditioning, fit.result, fit.model), dir);
        if (!quiet) io.stderr(`report: ${written.html}\n`);
      });
      json = JSON.stringify(choice.kind === "separate" ? perBandResults(results) : results[0], null, 2) + "\n";
    }
    writeOutput(json, textOption(values, "out"), io);
    return 0;
  },
};
