/**
 * The page's fit worker: reads the picked file, fits the chosen model, builds the report (figures
 * rendered to SVG by Vega, no DOM needed) and posts everything back. It runs off the page's thread, so
 * the page stays responsive; cancelling terminates the worker.
 */
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { InputError } from "../../src/errors/input-error.js";
import { UnrecognisedColumnError } from "../../src/errors/unrecognised-column-error.js";
import type { SamplerProgress } from "../../src/inference/index.js";
import { bandPredictionCsv } from "../../src/models/band-prediction-csv.js";
import { fitJointDetailed } from "../../src/models/fit-joint.js";
import { fitLightCurveDetailed } from "../../src/models/fit-light-curve.js";
import type { FitResult } from "../../src/models/fit-result.js";
import { predictionCsv } from "../../src/models/prediction-csv.js";
import { jointReportInput } from "../../src/report/joint-report-input.js";
import type { ReportInput } from "../../src/report/report-input.js";
import { htmlReport } from "../../src/report/html-report.js";
import { renderSvg } from "../../src/report/render-svg.js";
import { reportFigures } from "../../src/report/report-figures.js";
import { reportInputFromFit } from "../../src/report/report-from-fit.js";
import { readUploadedLightCurves } from "./read-upload.js";
import type { FitRequest, WorkerMessage } from "./worker-messages.js";

interface WorkerScope {
  onmessage: ((event: MessageEvent<FitRequest>) => void) | null;
  postMessage(message: WorkerMessage): void;
}
const scope = self as unknown as WorkerScope;

/** Milliseconds between two progress messages: often enough for a smooth bar, rare enough to cost nothing. */
const PROGRESS_INTERVAL = 100;

scope.onmessage = (event) => {
  fitRequest(event.data).then(
    (message) => scope.postMessage(message),
    (error: unknown) => scope.postMessage(errorMessage(error)),
  );
};

async function fitRequest(request: FitRequest): Promise<WorkerMessage> {
  const start = performance.now();
  const file = request.fileName;
  const set = await readUploadedLightCurves(new Uint8Array(request.bytes), file, {
    ...(request.columns
      ? { timeColumn: request.columns.timeColumn, valueColumn: request.columns.valueColumn, errorColumn: request.columns.errorColumn }
      : {}),
  });
  const lightCurves = set.lightCurves;
  if (lightCurves.length === 0) throw new InputError("the file holds no light curve", { file });
  // Dropped and sorted rows are in the fit's own warnings already; the other notes of reading (an assumed
  // unit, converted timestamps) go first.
  const readingNotes = set.warnings.filter((w) => !/dropped|sorted by time/.test(w));
  // The rule of the command line's verbs (src/cli/band-choice.ts), with the joint model as the page's default.
  const joint = lightCurves.length > 1 && request.bands === "joint" && request.band === undefined;
  if (!joint && (request.lags || request.referenceBand !== undefined))
    throw new InputError(
      `${request.lags ? "lags" : "a reference band"} need${request.lags ? "" : "s"} several bands fitted jointly${lightCurves.length === 1 ? " (the file holds one band)" : ""}`,
      { file },
    );
  const fitted = joint ? jointFit(lightCurves, request, readingNotes) : oneBandFit(oneBand(lightCurves, request, readingNotes), request, readingNotes);
  scope.postMessage({ type: "progress", stage: "drawing the report", fraction: 1, evaluations: fitted.result.diagnostics.likelihoodEvaluations });
  const drawn = [];
  for (const figure of reportFigures(fitted.input)) drawn.push({ figure, svg: await renderSvg(figure) });
  return {
    type: "done",
    resultJson: JSON.stringify(fitted.result, null, 2) + "\n",
    predictionsCsv: fitted.predictionsCsv,
    reportHtml: htmlReport(fitted.input, drawn, { figureFiles: false }),
    downloadStem: `${fileStem(file)}-${request.model}${joint ? "-joint" : ""}`,
    seconds: (performance.now() - start) / 1000,
  };
}

/** What a fit hands to the report and the downloads. */
interface FittedForPage {
  readonly result: FitResult;
  readonly input: ReportInput;
  readonly predictionsCsv: string;
}

/** One band on its own: the one named, or the first (said in the warnings when the file holds more). */
function oneBand(lightCurves: readonly LightCurve[], request: FitRequest, notes: string[]): LightCurve {
  const names = lightCurves.map((lc) => lc.band ?? "?");
  if (request.band !== undefined) {
    const named = lightCurves.find((lc) => lc.band === request.band);
    if (!named) throw new InputError(`no band "${request.band}" in the file (bands: ${names.join(", ")})`, { file: request.fileName });
    return named;
  }
  if (lightCurves.length > 1) notes.push(`the file holds ${names.length} bands (${names.join(", ")}); the page fitted band ${names[0]} on its own`);
  return lightCurves[0];
}

function oneBandFit(lightCurve: LightCurve, request: FitRequest, notes: readonly string[]): FittedForPage {
  if (request.robust && !lightCurve.error)
    throw new InputError("robust noise needs an error column (the Student-t noise scales each point's error)", { file: request.fileName });
  const fit = fitLightCurveDetailed(lightCurve, {
    ...sharedOptions(request),
    ...(request.robust ? { robust: true } : {}),
  });
  const result = { ...fit.result, warnings: [...notes, ...fit.result.warnings] };
  const input = { ...reportInputFromFit(lightCurve, result, fit.model), title: reportTitle(request, lightCurve.band === undefined ? undefined : `band ${lightCurve.band}`) };
  const p = input.prediction;
  return { result, input, predictionsCsv: p.lower95 && p.upper95 ? predictionCsv({ ...p, lower95: p.lower95, upper95: p.upper95 }) : "" };
}

/** Every band at once: one shared process, an amplitude and a mean per band (and lags); one panel per band in the report. */
function jointFit(lightCurves: readonly LightCurve[], request: FitRequest, notes: readonly string[]): FittedForPage {
  if (request.robust)
    throw new InputError("robust noise fits one band at a time (the joint model of several bands has none): choose one band on its own", { file: request.fileName });
  const fit = fitJointDetailed(lightCurves, {
    ...sharedOptions(request),
    ...(request.lags ? { lags: true } : {}),
    ...(request.referenceBand !== undefined ? { referenceBand: request.referenceBand } : {}),
  });
  const result = { ...fit.result, warnings: [...notes, ...fit.result.warnings] };
  const input = { ...jointReportInput({ ...fit, result }), title: reportTitle(request, `${lightCurves.length} bands jointly`) };
  const panels = input.bandPanels ?? [];
  const curves = panels.flatMap(({ band, prediction: p }) => (p.lower95 && p.upper95 ? [{ band, curve: { ...p, lower95: p.lower95, upper95: p.upper95 } }] : []));
  return { result, input, predictionsCsv: curves.length === panels.length ? bandPredictionCsv(curves) : "" };
}

/** The fit options both routes take from the form, with the progress messages. */
function sharedOptions(request: FitRequest) {
  return {
    model: request.model,
    seed: request.seed,
    maxEvaluations: request.maxEvaluations,
    ...(request.background ? { background: "drw" as const } : {}),
    ...(request.redshift !== undefined ? { redshift: request.redshift } : {}),
    onProgress: progressMessages(),
  };
}

/** Posts the sampler's progress at most every `PROGRESS_INTERVAL` ms. */
function progressMessages(): (progress: SamplerProgress) => void {
  let last = 0;
  return (progress) => {
    const now = performance.now();
    if (now - last < PROGRESS_INTERVAL) return;
    last = now;
    const c = progress.convergence;
    scope.postMessage({
      type: "progress",
      stage: progress.phase === "warmup" ? "warm-up" : "sampling",
      fraction: progress.fraction,
      evaluations: progress.likelihoodEvaluations,
      ...(c ? { rhatMax: c.rhatMax, rhatThreshold: c.rhatThreshold, converged: c.converged } : {}),
    });
  };
}

/** `<file stem>, <what was fitted>: <model>`. */
function reportTitle(request: FitRequest, fitted: string | undefined): string {
  return `${fileStem(request.fileName)}${fitted === undefined ? "" : `, ${fitted}`}: ${request.model}`;
}

/** The file name without folders and extensions (`lds-quasar.csv.gz` -> `lds-quasar`). */
function fileStem(name: string): string {
  return name.replace(/^.*[\\/]/, "").replace(/\.gz$/i, "").replace(/\.[^.]+$/, "") || "light-curve";
}

function errorMessage(error: unknown): WorkerMessage {
  if (error instanceof UnrecognisedColumnError) return { type: "columns", message: error.message, columns: error.columns };
  if (error instanceof InputError || error instanceof RangeError) return { type: "error", message: error.message };
  const text = error instanceof Error ? error.message : String(error);
  return { type: "error", message: `internal error: ${text}` };
}
