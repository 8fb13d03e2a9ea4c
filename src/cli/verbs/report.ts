import { InputError } from "../../errors/input-error.js";
import { readLightCurves } from "../../lightcurve/read-light-curves.js";
import { modelFromResult } from "../../models/model-from-result.js";
import { reportInputFromFit } from "../../report/report-from-fit.js";
import { jointReportInput } from "../../report/joint-report-input.js";
import type { ReportInput } from "../../report/report-input.js";
import type { FitResult } from "../../models/fit-result.js";
import { jointModelFromResult } from "../../models/joint-model-from-result.js";
import { writeReport } from "../../report/write-report.js";
import { resolve } from "node:path";
import type { CliIo, CliVerb } from "../cli-io.js";
import { fromStoredResult, readFitResult } from "../read-result.js";
import { OUTPUT_OPTIONS, textOption, withSingleInput, type SingleInputArguments } from "../verb-arguments.js";

const HELP = `Usage: horologium report RESULT.json [--data FILE] [--out DIR] [--band NAME]

Writes a self-contained HTML report (DIR/report.html) with its figures as SVG and PNG
(DIR/figures/): the data with the posterior-predictive band across the gaps, the corner plot of
the posterior, the model power spectrum over the periodogram, the chain traces, the diagnostics,
the warnings and a plain-language summary.

The light curve is read again from the file named in the result (data.source) with the same
columns, unless --data names another copy of it.

Options:
  --data FILE             the light-curve file (default: the result's data.source)
  --out DIR               output folder (default: report)
  --band NAME             the band, for a file of per-band results (fit --bands separate); a joint
                          multi-band result gives one report with a light-curve panel per band
  --quiet                 print nothing

Example:
  horologium fit demo/lds-j0412-2731-quasar.csv --model drw --out quasar.json
  horologium report quasar.json --out quasar-report
`;

const OPTIONS = {
  ...OUTPUT_OPTIONS,
  data: { type: "string" },
  band: { type: "string" },
} as const;

/** The report input of a joint multi-band result: every band read again, the joint model rebuilt. */
async function jointInput(result: FitResult, dataPath: string, resultPath: string, io: CliIo): Promise<ReportInput> {
  const data = result.data;
  const set = await readLightCurves(resolve(io.cwd, dataPath), {
    timeColumn: data.timeColumn,
    valueColumn: data.valueColumn,
    errorColumn: data.errorColumn,
    unit: data.unit,
  });
  const bands = result.bands!;
  const lightCurves = bands.names.map((name) => {
    const lightCurve = set.lightCurves.find((lc) => lc.band === name);
    if (!lightCurve || lightCurve.time.length !== bands.points[name])
      throw new InputError(`band ${name}: ${lightCurve ? `${lightCurve.time.length} points` : "absent"}, the result was fitted to ${bands.points[name]}: not the same data`, { file: dataPath });
    return lightCurve;
  });
  return fromStoredResult(resultPath, () => jointReportInput({ result, lightCurves, model: jointModelFromResult(result, lightCurves) }));
}

/** `horologium report`. */
export const verb: CliVerb = {
  summary: "HTML report with figures (SVG and PNG) from a fit result",
  run: withSingleInput(OPTIONS, HELP, reportFromResult, "RESULT.json"),
};

/** The report of the result file RESULT.json, written to `--out` (default `report`). */
async function reportFromResult({ values, file: resultPath, quiet }: SingleInputArguments, io: CliIo): Promise<number> {
  const result = readFitResult(resultPath, io.cwd, textOption(values, "band"));
  const data = result.data;
  const dataPath = textOption(values, "data") ?? data.source;
  if (result.bands) {
    const written = await writeReport(await jointInput(result, dataPath, resultPath, io), resolve(io.cwd, textOption(values, "out") ?? "report"));
    if (!quiet) io.stdout(`${written.html}\n`);
    return 0;
  }
  const set = await readLightCurves(resolve(io.cwd, dataPath), {
    timeColumn: data.timeColumn,
    valueColumn: data.valueColumn,
    errorColumn: data.errorColumn,
    ...(data.band !== undefined ? { band: data.band } : {}),
    unit: data.unit,
  });
  const lightCurve = set.lightCurves[0];
  if (lightCurve.time.length !== result.data.n)
    throw new InputError(`the light curve has ${lightCurve.time.length} points, the result was fitted to ${result.data.n}: not the same data`, { file: dataPath });
  const input = fromStoredResult(resultPath, () =>
    reportInputFromFit(lightCurve, result, modelFromResult(result, lightCurve)),
  );
  const written = await writeReport(input, resolve(io.cwd, textOption(values, "out") ?? "report"));
  if (!quiet) io.stdout(`${written.html}\n`);
  return 0;
}
