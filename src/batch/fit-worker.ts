/**
 * The body of a batch worker thread: loads the fit module once, then fits the objects the pool sends,
 * one at a time, answering each with the object's flattened result row or the reason it failed (a fit
 * result is checked key by key, parseFitResult). A fit
 * that throws is reported, not fatal; a fit that crashes the thread is noticed by the pool.
 */
import { parentPort, workerData } from "node:worker_threads";
import type { LightCurve } from "../lightcurve/light-curve.js";
import type { FitResult } from "../models/fit-result.js";
import { parseFitResult } from "../models/parse-fit-result.js";
import { isPerBandResults, type PerBandResults } from "../models/per-band-results.js";
import type { FitRequest, FitWorkerData, FitWorkerMessage } from "./fit-worker-protocol.js";
import { okRow, perBandRow, type ResultRow } from "./result-row.js";

type FitFunction = (lightCurve: LightCurve, options: FitRequest["options"]) => FitResult | Promise<FitResult>;
type BandsFunction = (lightCurves: readonly LightCurve[], options: FitRequest["options"]) => FitResult | PerBandResults | Promise<FitResult | PerBandResults>;

const port = parentPort;
if (!port) throw new Error("fit-worker.js runs as a worker thread of the batch pool");
const send = (message: FitWorkerMessage): void => port.postMessage(message);

const { fitModule } = (workerData ?? {}) as FitWorkerData;
const moduleUrl = fitModule ?? new URL("../models/fit-band-set.js", import.meta.url).href;

let fit: FitFunction | undefined;
let fitBands: BandsFunction | undefined;
try {
  const loaded = (await import(moduleUrl)) as { fitLightCurve?: unknown; fitBands?: unknown };
  if (typeof loaded.fitLightCurve !== "function") throw new Error("it does not export a function fitLightCurve");
  fit = loaded.fitLightCurve as FitFunction;
  if (typeof loaded.fitBands === "function") fitBands = loaded.fitBands as BandsFunction;
} catch (error) {
  send({ kind: "load-failed", reason: `cannot load the fit module ${moduleUrl}: ${messageOf(error)}` });
}

if (fit) {
  const fitObject = fit;
  port.on("message", async (request: FitRequest) => {
    try {
      // Every key is checked, so that a fit module returning a malformed result fails the object with a
      // reason naming the field instead of writing a row with holes.
      send({ kind: "fitted", row: await fittedRow(fitObject, request) });
    } catch (error) {
      send({ kind: "fit-failed", reason: messageOf(error) });
    }
  });
  send({ kind: "ready" });
}

/** The row of one object: one band by `fitLightCurve`, several by `fitBands` (joint or per band). */
async function fittedRow(fitObject: FitFunction, request: FitRequest): Promise<ResultRow> {
  const { objectId, lightCurves, options } = request;
  const [first] = lightCurves;
  const source = `the result of ${moduleUrl}`;
  if (lightCurves.length === 1 && first) return okRow(objectId, options.seed, parseFitResult(await fitObject(first, options), source));
  if (!fitBands) throw new Error(`the object has ${lightCurves.length} bands and ${moduleUrl} exports no fitBands(lightCurves, options); choose one with --band`);
  const result = await fitBands(lightCurves, options);
  if (!isPerBandResults(result)) return okRow(objectId, options.seed, parseFitResult(result, source));
  const perBand = Object.fromEntries(Object.entries(result.perBand).map(([band, r]) => [band, parseFitResult(r, `${source} (band ${band})`)]));
  return perBandRow(objectId, options.seed, perBand);
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
