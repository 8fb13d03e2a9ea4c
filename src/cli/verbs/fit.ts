import { resolve } from "node:path";
import { jointReportInput } from "../../report/joint-report-input.js";
import { reportInputFromFit } from "../../report/report-from-fit.js";
import { writeReport } from "../../report/write-report.js";
import { BAND_HELP, bandChoice } from "../band-choice.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { MODEL_NAMES } from "../../models/light-curve-model.js";
import { FILE_FIT_OPTIONS, FIT_HELP, fitArguments } from "../fit-arguments.js";
import { fitJointWithProgress, perBandResults } from "../fit-bands.js";
import { fitAll, requireErrorsForRobust } from "../fit-light-curves.js";
import { readInput } from "../read-input.js";
import { COLUMN_HELP, textOption, withSingleInput } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";

const HELP = `Usage: horologium fit FILE --model ${MODEL_NAMES.join("|")} [options]

Fits a Gaussian-process model to a light curve (CSV/TSV, Parquet or FITS binary table) and writes
the result as JSON: posterior summaries of every parameter, derived quantities, sampler
diagnostics and warnings about what the data do not constrain.

Options:
${FIT_HELP}
  --out FILE              write the JSON here (default: standard output)
  --report DIR            also write an HTML report with figures to DIR
  --quiet                 no progress bar, no summary on stderr
${COLUMN_HELP}
${BAND_HELP}

Examples (the invented objects of the Lanternfield Deep Survey in demo/):
  horologium fit demo/lds-j0412-2731-quasar.csv --model drw --redshift 1.62 --seed 7 --out quasar.json --report quasar-report
  horologium fit demo/lds-v2291-spotted-star.csv --model quasi-periodic --robust --out star.json --report star-report
  # a file with a band column: --bands joint --lags fits one process to every band, with per-band lags
`;

const OPTIONS = {
  ...FILE_FIT_OPTIONS,
  report: { type: "string" },
} as const;

/** `horologium fit`. */
export const verb: CliVerb = {
  summary: "fit a model to a light curve: posterior summaries, diagnostics, warnings (JSON)",
  run: withSingleInput(OPTIONS, HELP, async ({ values, file, quiet }, io: CliIo) => {
    const options = fitArguments(values, true);
    const lightCurves = await readInput(file, values, io, quiet);
    requireErrorsForRobust(lightCurves, options, file);
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
        const written = await writeReport(reportInputFromFit(lightCurve, fit.result, fit.model), dir);
        if (!quiet) io.stderr(`report: ${written.html}\n`);
      });
      json = JSON.stringify(choice.kind === "separate" ? perBandResults(results) : results[0], null, 2) + "\n";
    }
    writeOutput(json, textOption(values, "out"), io);
    return 0;
  }),
};
