/**
 * The page: reads the form, hands the file to a fit worker, shows its progress, and at the end the
 * report with the downloads. `document.body.dataset.fitState` says where it is: idle, fitting,
 * columns (the page asks which column is which), done, error or cancelled.
 */
import { KERNEL_FAMILIES } from "../../src/kernels/families.js";
import type { AnyKernelFamily } from "../../src/kernels/kernel-family.js";
import type { ColumnAnswer, FitDone, FitRequest, ProgressMessage, WorkerMessage } from "./worker-messages.js";

type FitState = "idle" | "fitting" | "columns" | "done" | "error" | "cancelled";

const form = element<HTMLFormElement>("fit-form");
const fileInput = element<HTMLInputElement>("file");
const cancelButton = element<HTMLButtonElement>("cancel");
const startButton = element<HTMLButtonElement>("start");
const progressBar = element<HTMLProgressElement>("progress");
const progressText = element<HTMLParagraphElement>("progress-text");
const errorText = element<HTMLParagraphElement>("error");
const columnsBox = element<HTMLFieldSetElement>("columns");
const results = element<HTMLElement>("results");
const frame = element<HTMLIFrameElement>("report-frame");
fillModelChoices(element<HTMLSelectElement>("model"));

let worker: Worker | undefined;
/** Object URLs of the current downloads, revoked when the next fit starts. */
let downloadUrls: string[] = [];
/** Set while the page asks for columns, so the next submit sends the answer. */
let askedColumns = false;

form.addEventListener("submit", (event) => {
  event.preventDefault();
  void startFit();
});
cancelButton.addEventListener("click", () => {
  stopWorker();
  progressText.textContent = "Cancelled.";
  finish("cancelled");
});
fileInput.addEventListener("change", () => {
  askedColumns = false;
  columnsBox.hidden = true;
});
frame.addEventListener("load", () => {
  const doc = frame.contentDocument;
  if (doc) frame.style.height = `${doc.documentElement.scrollHeight + 20}px`;
});

async function startFit(): Promise<void> {
  const file = fileInput.files?.[0];
  if (!file) return showError("Choose a light-curve file first.");
  stopWorker();
  clearResults();
  const request: FitRequest = {
    type: "fit",
    fileName: file.name,
    bytes: await file.arrayBuffer(),
    model: formValue("model") as FitRequest["model"],
    background: checked("background"),
    robust: checked("robust"),
    seed: numberValue("seed") ?? 1,
    maxEvaluations: numberValue("max-evaluations") ?? 2e6,
    ...optionalNumber("redshift"),
    ...(askedColumns ? { columns: columnAnswer() } : {}),
    bands: formValue("bands") === "one" ? "one" : "joint",
    lags: checked("lags"),
    ...optionalText("band", "band"),
    ...optionalText("reference-band", "referenceBand"),
  };
  setState("fitting");
  progressBar.hidden = false;
  progressBar.value = 0;
  progressText.textContent = `Reading ${file.name}…`;
  startButton.disabled = true;
  cancelButton.disabled = false;
  const current = new Worker(new URL("./fit-worker.ts", import.meta.url), { type: "module" });
  worker = current;
  current.onmessage = (event: MessageEvent<WorkerMessage>) => {
    if (worker === current) handleMessage(event.data);
  };
  current.onerror = (event) => {
    event.preventDefault();
    if (worker !== current) return;
    stopWorker();
    showError(`internal error: ${event.message || "the fit worker stopped"}`);
  };
  current.postMessage(request, [request.bytes]);
}

function handleMessage(message: WorkerMessage): void {
  switch (message.type) {
    case "progress":
      return showProgress(message);
    case "columns":
      stopWorker();
      return askColumns(message.message, message.columns);
    case "error":
      stopWorker();
      return showError(message.message);
    case "done":
      stopWorker();
      return showResult(message);
  }
}

function showProgress(p: ProgressMessage): void {
  progressBar.value = p.fraction;
  const parts = [`${Math.round(100 * p.fraction)}%`, p.stage, `${p.evaluations.toLocaleString("en")} likelihood evaluations`];
  if (p.rhatMax !== undefined && p.rhatThreshold !== undefined) {
    parts.push(
      p.converged
        ? `converged (largest R-hat ${p.rhatMax.toFixed(3)} < ${p.rhatThreshold.toFixed(3)})`
        : `not yet converged (largest R-hat ${p.rhatMax.toFixed(3)}, needs < ${p.rhatThreshold.toFixed(3)})`,
    );
  } else {
    parts.push("no convergence check yet");
  }
  progressText.textContent = parts.join(" · ");
}

function showResult(done: FitDone): void {
  progressBar.value = 1;
  progressText.textContent = `Done in ${done.seconds.toFixed(1)} s.`;
  offerDownload("download-result", `${done.downloadStem}.json`, done.resultJson, "application/json");
  offerDownload("download-predictions", `${done.downloadStem}-predictions.csv`, done.predictionsCsv, "text/csv");
  offerDownload("download-report", `${done.downloadStem}-report.html`, done.reportHtml, "text/html");
  frame.srcdoc = done.reportHtml;
  results.hidden = false;
  finish("done");
}

function askColumns(message: string, columns: readonly string[]): void {
  fill("time-col", columns, guess(columns, /time|date|mjd|jd|epoch|hjd/i, 0));
  fill("value-col", columns, guess(columns, /mag|flux|brightness|value/i, 1));
  fill("error-col", ["none", ...columns], guess(columns, /err|sig|unc/i, -1) + 1);
  element<HTMLParagraphElement>("columns-note").textContent = `${message}. Choose the columns below and fit again.`;
  columnsBox.hidden = false;
  askedColumns = true;
  progressBar.hidden = true;
  progressText.textContent = "";
  finish("columns");
}

function columnAnswer(): ColumnAnswer {
  const error = formValue("error-col");
  return { timeColumn: formValue("time-col"), valueColumn: formValue("value-col"), errorColumn: error === "none" ? null : error };
}

function showError(message: string): void {
  errorText.textContent = message;
  errorText.hidden = false;
  progressBar.hidden = true;
  progressText.textContent = "";
  finish("error");
}

function finish(state: FitState): void {
  startButton.disabled = false;
  cancelButton.disabled = true;
  setState(state);
}

function setState(state: FitState): void {
  document.body.dataset["fitState"] = state;
}

function stopWorker(): void {
  worker?.terminate();
  worker = undefined;
}

function clearResults(): void {
  for (const url of downloadUrls) URL.revokeObjectURL(url);
  downloadUrls = [];
  errorText.hidden = true;
  errorText.textContent = "";
  results.hidden = true;
  frame.removeAttribute("srcdoc");
}

function offerDownload(id: string, fileName: string, text: string, type: string): void {
  const link = element<HTMLAnchorElement>(id);
  const url = URL.createObjectURL(new Blob([text], { type }));
  downloadUrls.push(url);
  link.href = url;
  link.download = fileName;
  link.hidden = text === "";
}

function fill(id: string, options: readonly string[], selected: number): void {
  const select = element<HTMLSelectElement>(id);
  select.replaceChildren(...options.map((name) => new Option(name, name)));
  select.selectedIndex = Math.max(0, Math.min(selected, options.length - 1));
}

function guess(columns: readonly string[], pattern: RegExp, fallback: number): number {
  const index = columns.findIndex((name) => pattern.test(name));
  return index >= 0 ? index : fallback;
}

/**
 * The model menu, from the library: one entry per kernel family that offers a model of the trade (its
 * descriptor names the model and says what it is for), so the page lists exactly the models a fit knows.
 */
function fillModelChoices(select: HTMLSelectElement): void {
  for (const family of KERNEL_FAMILIES as readonly AnyKernelFamily[]) {
    if (family.model === undefined) continue;
    const option = document.createElement("option");
    option.value = family.model.name;
    option.textContent = `${family.model.name} (${family.model.purpose})`;
    select.append(option);
  }
}

function formValue(name: string): string {
  const value = new FormData(form).get(name);
  return typeof value === "string" ? value : "";
}

function checked(name: string): boolean {
  return new FormData(form).get(name) !== null;
}

function numberValue(name: string): number | undefined {
  const text = formValue(name).trim();
  if (text === "") return undefined;
  const value = Number(text);
  return Number.isFinite(value) ? value : undefined;
}

function optionalNumber(name: "redshift"): { redshift?: number } {
  const value = numberValue(name);
  return value === undefined ? {} : { [name]: value };
}

function optionalText<K extends "band" | "referenceBand">(name: string, key: K): { [key in K]?: string } {
  const text = formValue(name).trim();
  return (text === "" ? {} : { [key]: text }) as { [key in K]?: string };
}

function element<T extends HTMLElement>(id: string): T {
  const found = document.getElementById(id);
  if (!found) throw new Error(`the page has no #${id}`);
  return found as T;
}
