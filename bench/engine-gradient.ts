import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { semiseparableLogLikelihoodGradient, type GradientWorkspace } from "../src/linalg/semiseparable-gradient.js";
import type { EngineCase, EngineData } from "./engine-cases.js";
import { coreLogLikelihood, fullLogLikelihood, newProcessEvaluation, preparedInputs, type TimingSettings } from "./engine-likelihood.js";
import { withNativeEngine } from "./engine-native.js";
import { calibrateRepeat, median, nanosecondsPerPoint, runRotatingRounds, timeBatch, type Batch } from "./engine-timing.js";

/** The gradient of one kernel on one light curve, in likelihoods and against the C reference. */
export interface GradientRow {
  readonly components: number;
  readonly n: number;
  /**
   * ns per point of a sampler's step: kernel from parameter values, `withKernel` on the light curve's checked
   * inputs, then logLikelihood or logLikelihoodGradient (which reuses the inputs' tape).
   */
  readonly tsLikelihoodStep: number;
  readonly tsGradientStep: number;
  /** ns per point on prepared inputs: the recursion, and the gradient (its tape reused between calls). */
  readonly tsLikelihoodCore: number;
  readonly tsGradientCore: number;
  readonly nativeLikelihoodCore: number;
  readonly nativeGradientCore: number;
  /** Medians over rounds of per-round ratios: gradient / likelihood (step, new process, core; C core) and TS / C. */
  readonly costStep: number;
  /** The same with a new GaussianProcess per call (inputs checked and copied, a fresh tape allocated). */
  readonly costNewProcess: number;
  readonly costCore: number;
  readonly nativeCost: number;
  readonly ratioGradient: number;
  readonly ratioLikelihood: number;
  /** Largest |TS - C| over the gradient's components, relative to the largest |component| (at least 1). */
  readonly gradientDifference: number;
}

/** One gradient as an inference step does it: kernel from parameter values, a new GP, evaluate. */
export function fullGradient(engineCase: EngineCase, data: EngineData): () => number {
  return newProcessEvaluation(engineCase, data, (process) => process.logLikelihoodGradient(data.value).value);
}

/** A sampler's step: the kernel from parameter values on a process made once (`withKernel`), then `evaluate`. */
function samplerStep<T>(engineCase: EngineCase, data: EngineData, evaluate: (process: GaussianProcess) => T): () => T {
  const template = engineCase.kernel;
  const values = template.parameterValues;
  const base = new GaussianProcess(template, data.time, { errors: data.errors, mean: data.mean });
  return () => evaluate(base.withKernel(template.withParameters(values), { mean: data.mean }));
}

/** The kernel gradient on prepared inputs, as a sampler calls it: the workspace keeps the tape between calls. */
function coreGradient(engineCase: EngineCase, data: EngineData): { run: () => number; gradient: () => Float64Array } {
  const { form, noise, residual } = preparedInputs(engineCase, data);
  const workspace: GradientWorkspace = {};
  const evaluate = () => semiseparableLogLikelihoodGradient(form, data.time, noise, residual, { pointwise: false, workspace });
  return { run: () => evaluate().value, gradient: () => evaluate().kernel };
}

/**
 * Times the gradient against the likelihood and against the C reference's gradient (bench/c/engine-loglike.c,
 * "gradient" requests), interleaved like measureLikelihood: every round runs one batch of each of the eight
 * measurements in an order that rotates from round to round; ratios are taken within a round.
 */
export async function measureGradient(
  engineCase: EngineCase,
  data: EngineData,
  executable: string,
  dataFile: string,
  settings: TimingSettings,
): Promise<GradientRow> {
  const n = data.time.length;
  const likelihoodStep = samplerStep(engineCase, data, (process) => process.logLikelihood(data.value));
  const gradientStep = samplerStep(engineCase, data, (process) => process.logLikelihoodGradient(data.value).value);
  const likelihoodCore = coreLogLikelihood(engineCase, data);
  const gradientCore = coreGradient(engineCase, data);
  return withNativeEngine(executable, dataFile, data, engineCase.nativeTerms, async (native) => {
    const ts = [likelihoodStep, gradientStep, fullLogLikelihood(engineCase, data), fullGradient(engineCase, data), likelihoodCore, gradientCore.run];
    for (const work of ts) work();
    const tsRepeat = ts.map((work) => calibrateRepeat(work, settings.batchSeconds));
    const nativeModes = ["core", "gradient"] as const;
    const nativeRepeat: number[] = [];
    for (const mode of nativeModes) nativeRepeat.push(await native.calibrateRepeat(mode, settings.batchSeconds));
    const samples: Batch[][] = [[], [], [], [], [], [], [], []];
    const steps: Array<() => Promise<void>> = [
      ...ts.map((work, i) => async () => void samples[i].push(timeBatch(work, tsRepeat[i]))),
      ...nativeModes.map((mode, i) => async () => void samples[ts.length + i].push(await native.run(mode, nativeRepeat[i]))),
    ];
    await runRotatingRounds(steps, settings.rounds);
    const repeats = [...tsRepeat, ...nativeRepeat];
    const perPoint = samples.map((batches, i) => batches.map((batch) => nanosecondsPerPoint(batch, repeats[i], n, settings.clock)));
    const ratio = (a: number, b: number) => median(perPoint[a].map((value, round) => value / perPoint[b][round]));
    const nativeGradient = (await native.run("gradient", 1)).gradient;
    const tsGradient = gradientCore.gradient();
    const scale = Math.max(1, ...nativeGradient.map(Math.abs));
    const gradientDifference = Math.max(...nativeGradient.map((g, c) => Math.abs(g - tsGradient[c]) / scale));
    return {
      components: engineCase.components,
      n,
      tsLikelihoodStep: median(perPoint[0]),
      tsGradientStep: median(perPoint[1]),
      tsLikelihoodCore: median(perPoint[4]),
      tsGradientCore: median(perPoint[5]),
      nativeLikelihoodCore: median(perPoint[6]),
      nativeGradientCore: median(perPoint[7]),
      costStep: ratio(1, 0),
      costNewProcess: ratio(3, 2),
      costCore: ratio(5, 4),
      nativeCost: ratio(7, 6),
      ratioGradient: ratio(5, 7),
      ratioLikelihood: ratio(4, 6),
      gradientDifference: nativeGradient.length === tsGradient.length ? gradientDifference : NaN,
    };
  });
}
