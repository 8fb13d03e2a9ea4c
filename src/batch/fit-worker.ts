/**
 * The body of a batch worker thread: loads the fit module once, then fits the objects the pool sends,
 * one at a time, answering each with the object's flattened result row or the reason it failed (a fit
 * result is checked key by key, parseFitResult). A fit
 * that throws is reported, not fatal; a fit that crashes the thread is noticed by the pool.
 */
import { parentPort, workerData } from "node:worker_threads";
import type { FitResult } from "../models/fit-result.js";
import { parseFitResult } from "../models/parse-fit-result.js";
import type { FitRequest, FitWorkerData, FitWorkerMessage } from "./fit-worker-protocol.js";
import { okRow } from "./result-row.js";

type FitFunction = (lightCurve: FitRequest["lightCurve"], options: FitRequest["options"]) => FitResult | Promise<FitResult>;

const port = parentPort;
if (!port) throw new Error("fit-worker.js runs as a worker thread of the batch pool");
const send = (message: FitWorkerMessage): void => port.postMessage(message);

const { fitModule } = (workerData ?? {}) as FitWorkerData;
const moduleUrl = fitModule ?? new URL("../models/fit-light-curve.js", import.meta.url).href;

let fit: FitFunction | undefined;
try {
  const loaded = (await import(moduleUrl)) as { fitLightCurve?: unknown };
  if (typeof loaded.fitLightCurve !== "function") throw new Error("it does not export a function fitLightCurve");
  fit = loaded.fitLightCurve as FitFunction;
} catch (error) {
  send({ kind: "load-failed", reason: `cannot load the fit module ${moduleUrl}: ${messageOf(error)}` });
}

if (fit) {
  const fitObject = fit;
  port.on("message", async (request: FitRequest) => {
    try {
      // Every key is checked, so that a fit module returning a malformed result fails the object with a
      // reason naming the field instead of writing a row with holes.
      const result = parseFitResult(await fitObject(request.lightCurve, request.options), `the result of ${moduleUrl}`);
      send({ kind: "fitted", row: okRow(request.objectId, request.options.seed, result) });
    } catch (error) {
      send({ kind: "fit-failed", reason: messageOf(error) });
    }
  });
  send({ kind: "ready" });
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
