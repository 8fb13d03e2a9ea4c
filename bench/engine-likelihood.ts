import { GaussianProcess } from "../src/gp/gaussian-process.js";
import type { SemiseparableForm } from "../src/linalg/semiseparable-form.js";
import { semiseparableLogLikelihood } from "../src/linalg/semiseparable-likelihood.js";
import type { EngineCase, EngineData } from "./engine-cases.js";
import { withNativeEngine } from "./engine-native.js";
import { calibrateRepeat, median, nanosecondsPerPoint, runRotatingRounds, timeBatch, type Batch, type Clock } from "./engine-timing.js";

/** Settings shared by the timed sections. */
export interface TimingSettings {
  /** Interleaved rounds per measurement; the medians are over rounds. */
  readonly rounds: number;
  /** Target wall-clock seconds of one timed batch. */
  readonly batchSeconds: number;
  /** The clock the figures are read from: process CPU time (default; robust on a shared machine) or wall clock. */
  readonly clock: Clock;
}

/** The log-likelihood of one kernel on one light curve in TypeScript and in C. */
export interface LikelihoodRow {
  readonly components: number;
  readonly n: number;
  /** ns per point, build from parameters + check inputs + evaluate (median over rounds). */
  readonly tsFull: number;
  readonly nativeFull: number;
  /** ns per point, the recursion alone on prepared inputs. */
  readonly tsCore: number;
  readonly nativeCore: number;
  /** Median over rounds of TS / C measured in the same round. */
  readonly ratioFull: number;
  readonly ratioCore: number;
  /** The same full ratio read from the other clock (wall clock when the figures are CPU time, and vice versa). */
  readonly ratioFullOtherClock: number;
  readonly tsValue: number;
  readonly nativeValue: number;
}

/**
 * One evaluation as an inference step makes it: the kernel from parameter values, a new GaussianProcess
 * on the light curve (inputs checked and copied), then `evaluate`.
 */
export function newProcessEvaluation(engineCase: EngineCase, data: EngineData, evaluate: (process: GaussianProcess) => number): () => number {
  const template = engineCase.kernel;
  const values = template.parameterValues;
  const options = { errors: data.errors, mean: data.mean };
  return () => evaluate(new GaussianProcess(template.withParameters(values), data.time, options));
}

/** One log-likelihood, as an inference step does it: kernel from parameter values, a new GP, evaluate. */
export function fullLogLikelihood(engineCase: EngineCase, data: EngineData): () => number {
  return newProcessEvaluation(engineCase, data, (process) => process.logLikelihood(data.value));
}

/** What the engine's core functions take: the kernel's form, the noise variances and the residuals. */
export interface PreparedInputs {
  readonly form: SemiseparableForm;
  readonly noise: Float64Array;
  readonly residual: Float64Array;
}

/** The engine's inputs prepared once, outside the timed calls (the recursion alone is timed on them). */
export function preparedInputs(engineCase: EngineCase, data: EngineData): PreparedInputs {
  const form = engineCase.kernel.semiseparableForm();
  if (!form) throw new Error(`${engineCase.label} has no semiseparable form`);
  const n = data.time.length;
  const noise = new Float64Array(n);
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    noise[i] = data.errors[i] * data.errors[i];
    residual[i] = data.value[i] - data.mean;
  }
  return { form, noise, residual };
}

/** The recursion alone, on a prepared form, noise variances and residuals. */
export function coreLogLikelihood(engineCase: EngineCase, data: EngineData): () => number {
  const { form, noise, residual } = preparedInputs(engineCase, data);
  return () => semiseparableLogLikelihood(form, data.time, noise, residual);
}

/**
 * Times the TypeScript engine and the C reference on the same light curve, interleaved: every round runs
 * one batch of each of the four measurements (TS full, C full, TS core, C core), in an order that rotates
 * from round to round, so that a burst of load from other processes hits both engines alike. Ratios are
 * taken within a round, then their median over rounds is reported. Both clocks are read for every batch.
 */
export async function measureLikelihood(
  engineCase: EngineCase,
  data: EngineData,
  executable: string,
  dataFile: string,
  settings: TimingSettings,
): Promise<LikelihoodRow> {
  const n = data.time.length;
  const full = fullLogLikelihood(engineCase, data);
  const core = coreLogLikelihood(engineCase, data);
  return withNativeEngine(executable, dataFile, data, engineCase.nativeTerms, async (native) => {
    // Warm-up of this data size (caches, page faults, allocation sizes) on both sides.
    full();
    core();
    const tsFullRepeat = calibrateRepeat(full, settings.batchSeconds);
    const tsCoreRepeat = calibrateRepeat(core, settings.batchSeconds);
    const nativeFullRepeat = await native.calibrateRepeat("full", settings.batchSeconds);
    const nativeCoreRepeat = await native.calibrateRepeat("core", settings.batchSeconds);

    const other: Clock = settings.clock === "cpu" ? "wall" : "cpu";
    const samples = { tsFull: [] as Batch[], tsCore: [] as Batch[], nativeFull: [] as Batch[], nativeCore: [] as Batch[] };
    const steps: Array<() => Promise<void>> = [
      async () => void samples.tsFull.push(timeBatch(full, tsFullRepeat)),
      async () => void samples.nativeFull.push(await native.run("full", nativeFullRepeat)),
      async () => void samples.tsCore.push(timeBatch(core, tsCoreRepeat)),
      async () => void samples.nativeCore.push(await native.run("core", nativeCoreRepeat)),
    ];
    await runRotatingRounds(steps, settings.rounds);
    const perPoint = (batches: Batch[], repeat: number, clock: Clock) =>
      batches.map((batch) => nanosecondsPerPoint(batch, repeat, n, clock));
    const tsFull = perPoint(samples.tsFull, tsFullRepeat, settings.clock);
    const nativeFull = perPoint(samples.nativeFull, nativeFullRepeat, settings.clock);
    const tsCore = perPoint(samples.tsCore, tsCoreRepeat, settings.clock);
    const nativeCore = perPoint(samples.nativeCore, nativeCoreRepeat, settings.clock);
    const ratios = (a: number[], b: number[]) => a.map((value, i) => value / b[i]);
    return {
      components: engineCase.components,
      n,
      tsFull: median(tsFull),
      nativeFull: median(nativeFull),
      tsCore: median(tsCore),
      nativeCore: median(nativeCore),
      ratioFull: median(ratios(tsFull, nativeFull)),
      ratioCore: median(ratios(tsCore, nativeCore)),
      ratioFullOtherClock: median(
        ratios(perPoint(samples.tsFull, tsFullRepeat, other), perPoint(samples.nativeFull, nativeFullRepeat, other)),
      ),
      tsValue: samples.tsFull[samples.tsFull.length - 1].value,
      nativeValue: samples.nativeFull[samples.nativeFull.length - 1].value,
    };
  });
}
