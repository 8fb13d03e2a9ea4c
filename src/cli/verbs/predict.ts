import { InputError } from "../../errors/input-error.js";
import { UsageError } from "../../errors/usage-error.js";
import type { LightCurve } from "../../lightcurve/light-curve.js";
import { bandPredictionCsv } from "../../models/band-prediction-csv.js";
import type { FitResult } from "../../models/fit-result.js";
import { jointModelFromResult } from "../../models/joint-model-from-result.js";
import { jointPredictive } from "../../models/joint-predictive.js";
import { MODEL_NAMES, type LightCurveModel } from "../../models/light-curve-model.js";
import { conditioningLightCurve, modelFromResult } from "../../models/model-from-result.js";
import { posteriorPredictive, type PredictiveCurve } from "../../models/posterior-predictive.js";
import { evenlySpacedItems } from "../../numerics/even-thinning.js";
import { storedPosteriorSample } from "../../models/posterior-sample.js";
import { predictionCsv } from "../../models/prediction-csv.js";
import { BAND_HELP, bandChoice } from "../band-choice.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { FILE_FIT_OPTIONS, fitArguments } from "../fit-arguments.js";
import { fitJointWithProgress } from "../fit-bands.js";
import { fitWithProgress, requireErrorsForRobust } from "../fit-light-curves.js";
import { readInput } from "../read-input.js";
import { fromStoredResult, readFitResult } from "../read-result.js";
import { parseGrid, readTimesFile } from "../requested-times.js";
import { COLUMN_HELP, integerOption, textOption, withSingleInput, type VerbArguments } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";

const HELP = `Usage: horologium predict FILE --model MODEL (--at TIMES.csv | --grid START:STOP:STEP) [options]

Predicts the latent (noise-free) light curve at any times, inside seasonal gaps and after the
last point, from the posterior predictive: a mixture over posterior draws of the Gaussian-process
prediction, so that parameter uncertainty widens the band. Writes CSV with the columns
time,mean,sd,lower95,upper95; for a multi-band file time,band,mean,sd,lower95,upper95, one latent
curve per band (each band fitted on its own by default; with --bands joint or --from a joint
result, the shared process with each band given every band's data).

Options:
  --model NAME            the model of a fresh fit (${MODEL_NAMES.join(", ")}); with --from, the result's
  --from RESULT.json      use the posterior draws stored by "horologium fit" instead of refitting
  --at FILE               requested times: one per line, or a CSV with a time column
  --grid START:STOP:STEP  requested times on a regular grid
  --draws N               posterior draws in the mixture (default 200)
  --out FILE              write the CSV here (default: standard output)
  --background, --seed, --redshift, --jitter, --robust, --sampler, --max-evaluations,
  --min-period, --max-period   as for fit, when fitting afresh (see horologium fit --help)
  --quiet                 no progress bar, no summary on stderr
${COLUMN_HELP}
${BAND_HELP}

Example:
  horologium fit demo/lds-j0412-2731-quasar.csv --model drw --out quasar.json
  horologium predict demo/lds-j0412-2731-quasar.csv --from quasar.json --grid 58700:62200:5 --out forecast.csv
`;

const OPTIONS = {
  ...FILE_FIT_OPTIONS,
  from: { type: "string" },
  at: { type: "string" },
  grid: { type: "string" },
  draws: { type: "string" },
} as const;

/** `horologium predict`. */
export const verb: CliVerb = {
  summary: "posterior-predictive light curve at any times (CSV: time,mean,sd,lower95,upper95)",
  run: withSingleInput(OPTIONS, HELP, async ({ values, file, quiet }, io: CliIo) => {
    const at = textOption(values, "at");
    const grid = textOption(values, "grid");
    if ((at === undefined) === (grid === undefined)) throw new UsageError("give exactly one of --at FILE or --grid START:STOP:STEP");
    const times = at !== undefined ? readTimesFile(at, io.cwd) : parseGrid(grid!);
    const drawCount = integerOption(values, "draws", 1) ?? 200;
    const lightCurves = await readInput(file, values, io, quiet);
    const from = textOption(values, "from");
    const context: PredictContext = { from, values, io, quiet, times, drawCount, file };
    const stored = from !== undefined ? readFitResult(from, io.cwd, lightCurves.length === 1 ? lightCurves[0].band : textOption(values, "band")) : undefined;
    if (stored?.bands || (stored === undefined && lightCurves.length > 1)) {
      const curves = multiBandCurves(lightCurves, stored, context);
      writeOutput(bandPredictionCsv(curves), textOption(values, "out"), io);
      return 0;
    }
    if (lightCurves.length > 1) {
      // A per-band result file: each band predicted from its own result.
      const curves = lightCurves.map((lc) => ({ band: lc.band!, curve: singleBandCurve(lc, readFitResult(from!, io.cwd, lc.band), context) }));
      writeOutput(bandPredictionCsv(curves), textOption(values, "out"), io);
      return 0;
    }
    const curve = singleBandCurve(lightCurves[0], stored, context);
    writeOutput(predictionCsv(curve), textOption(values, "out"), io);
    return 0;
  }),
};

/** What every band's prediction shares: the options, the requested times and where messages go. */
interface PredictContext {
  readonly from: string | undefined;
  readonly values: VerbArguments["values"];
  readonly io: CliIo;
  readonly quiet: boolean;
  readonly times: Float64Array;
  readonly drawCount: number;
  readonly file: string;
}

/** One band's predictive curve: from a stored result, or after a fresh fit. */
function singleBandCurve(
  input: LightCurve,
  stored: FitResult | undefined,
  context: PredictContext,
): PredictiveCurve {
  const { model, lightCurve, rows } = stored !== undefined ? storedFit(input, stored, context) : freshFit(input, context);
  return posteriorPredictive(model, lightCurve, evenlySpacedItems(rows, context.drawCount), context.times);
}

/** The model, conditioning light curve and draws of one band's prediction. */
interface PredictionSource {
  readonly model: LightCurveModel;
  readonly lightCurve: LightCurve;
  readonly rows: readonly (readonly number[])[];
}

/** One band's prediction source from the result file of `--from`. */
function storedFit(input: LightCurve, result: FitResult, { from, values }: PredictContext): PredictionSource {
  // The fit options are checked by the same rules though only --model is used (against the result's).
  const requested = fitArguments(values, false).model;
  if (requested !== undefined && requested !== result.model)
    throw new UsageError(`--model ${requested} does not match the model of ${from} (${result.model})`);
  return fromStoredResult(from!, () => {
    const model = modelFromResult(result, input);
    return { model, lightCurve: conditioningLightCurve(result, input), rows: storedPosteriorSample(result, model.space.names).rows };
  });
}

/** One band's prediction source from a fit made now with the fit options. */
function freshFit(input: LightCurve, { values, io, quiet, file }: PredictContext): PredictionSource {
  const options = fitArguments(values, true);
  requireErrorsForRobust([input], options, file);
  const fit = fitWithProgress(input, options, io, quiet);
  return { model: fit.model, lightCurve: fit.conditioning, rows: fit.result.posteriorSample.rows };
}

/**
 * Every band's predictive curve from a joint fit (stored with `--from`, or fitted now by the band rule:
 * each band on its own by default, `--bands joint` for one shared process).
 */
function multiBandCurves(
  lightCurves: readonly LightCurve[],
  stored: FitResult | undefined,
  context: PredictContext,
): { band: string; curve: PredictiveCurve }[] {
  const { from, values, io, quiet, times, drawCount, file } = context;
  if (stored === undefined) {
    const choice = bandChoice(values, lightCurves);
    if (choice.kind !== "joint")
      return lightCurves.map((lc) => ({ band: lc.band!, curve: singleBandCurve(lc, undefined, context) }));
    const options = fitArguments(values, true);
    const fit = fitJointWithProgress(lightCurves, options, choice, io, quiet);
    const rows = evenlySpacedItems(fit.result.posteriorSample.rows, drawCount);
    return fit.model.bands.map((band, b) => ({ band, curve: jointPredictive(fit.model, lightCurves, rows, b, times) }));
  }
  const names = stored.bands!.names;
  const present = lightCurves.map((lc) => lc.band ?? "");
  if (names.length !== present.length || names.some((name, b) => name !== present[b]))
    throw new InputError(`${from} is a joint fit of bands ${names.join(", ")}; the file has ${present.join(", ")}`, { file });
  const { model, rows } = fromStoredResult(from!, () => {
    const joint = jointModelFromResult(stored, lightCurves);
    return { model: joint, rows: evenlySpacedItems(storedPosteriorSample(stored, joint.space.names).rows, drawCount) };
  });
  return model.bands.map((band, b) => ({ band, curve: jointPredictive(model, lightCurves, rows, b, times) }));
}
