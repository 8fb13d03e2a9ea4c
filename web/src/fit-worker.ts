/**
 * The page's fit worker: reads the picked file, fits the chosen model, builds the report (figures
 * rendered to SVG by Vega, no DOM needed) and posts everything back. It runs off the page's thread, so
 * the page stays responsive; cancelling terminates the worker.
 */
import type { LightCurve } from "../../src/lightcurve/light-curve.js";
import { InputError } from "../../src/errors/input-error.js";
import { UnrecognisedColumnError } from "../../src/errors/unrecognised-column-error.js";
import { fitLightCurveDetailed } from "../../src/models/fit-light-curve.js";
import { predictionCsv } from "../../src/models/prediction-csv.js";
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
  const set = await readUploadedLightCurves(new Uint8Array(request.bytes), request.fileName, {
    ...(request.columns
      ? { timeColumn: request.columns.timeColumn, valueColumn: request.columns.valueColumn, errorColumn: request.columns.errorColumn }
      : {}),
  });
  const lightCurve = set.lightCurves[0];
  if (lightCurve === undefined) throw new InputError("the file holds no light curve", { file: request.fileName });
  // Dropped and sorted rows are in the fit's own warnings already; the other notes of reading (an assumed
  // unit, converted timestamps) go first.
  const readingNotes = set.warnings.filter((w) => !/dropped|sorted by time/.test(w));
  if (set.lightCurves.length > 1) {
    const bands = set.lightCurves.map((lc) => lc.band ?? "?");
    readingNotes.push(`the file holds ${bands.length} bands (${bands.join(", ")}); the page fitted band ${lightCurve.band ?? bands[0]}`);
  }
  if (request.robust && !lightCurve.error)
    throw new InputError("robust noise needs an error column (the Student-t noise scales each point's error)", { file: request.fileName });

  let last = 0;
  const fit = fitLightCurveDetailed(lightCurve, {
    model: request.model,
    seed: request.seed,
    maxEvaluations: request.maxEvaluations,
    ...(request.background ? { background: "drw" as const } : {}),
    ...(request.robust ? { robust: true } : {}),
    ...(request.redshift !== undefined ? { redshift: request.redshift } : {}),
    onProgress: (progress) => {
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
    },
  });
  scope.postMessage({ type: "progress", stage: "drawing the report", fraction: 1, evaluations: fit.result.diagnostics.likelihoodEvaluations });
  const result = { ...fit.result, warnings: [...readingNotes, ...fit.result.warnings] };
  const input = { ...reportInputFromFit(lightCurve, result, fit.model), title: reportTitle(lightCurve, request) };
  const drawn = [];
  for (const figure of reportFigures(input)) drawn.push({ figure, svg: await renderSvg(figure) });
  const prediction = input.prediction;
  return {
    type: "done",
    resultJson: JSON.stringify(result, null, 2) + "\n",
    predictionsCsv:
      prediction.lower95 && prediction.upper95
        ? predictionCsv({ ...prediction, lower95: prediction.lower95, upper95: prediction.upper95 })
        : "",
    reportHtml: htmlReport(input, drawn, { figureFiles: false }),
    downloadStem: `${fileStem(request.fileName)}-${request.model}`,
    seconds: (performance.now() - start) / 1000,
  };
}

function reportTitle(lightCurve: LightCurve, request: FitRequest): string {
  return `${fileStem(request.fileName)}${lightCurve.band ? `, band ${lightCurve.band}` : ""}: ${request.model}`;
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
