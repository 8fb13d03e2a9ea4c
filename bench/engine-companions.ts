import { DenseGaussianProcess } from "../src/gp/dense-gaussian-process.js";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import type { EngineCase, EngineData } from "./engine-cases.js";
import { fullLogLikelihood, type TimingSettings } from "./engine-likelihood.js";
import { calibrateRepeat, median, timeBatch, type Batch } from "./engine-timing.js";

/** Two workloads timed in alternation: medians of each (ns per `points`) and of their per-round ratio. */
export interface PairTiming {
  /** ns per point of the reference workload. */
  readonly reference: number;
  /** ns per point of the compared workload. */
  readonly compared: number;
  /** Median over rounds of compared / reference (time per call). */
  readonly ratio: number;
}

/**
 * Times two workloads in alternating batches (order swapped every round). Costs are reported per point,
 * `referencePoints` and `comparedPoints` being the points each call handles; the ratio is per call.
 */
export function timePair(
  reference: () => number,
  compared: () => number,
  referencePoints: number,
  comparedPoints: number,
  settings: TimingSettings,
): PairTiming {
  reference();
  compared();
  const referenceRepeat = calibrateRepeat(reference, settings.batchSeconds);
  const comparedRepeat = calibrateRepeat(compared, settings.batchSeconds);
  const a: number[] = [];
  const b: number[] = [];
  const ratios: number[] = [];
  for (let round = 0; round < settings.rounds; round++) {
    let ta = 0;
    let tb = 0;
    const seconds = (batch: Batch) => (settings.clock === "cpu" ? batch.cpuSeconds : batch.seconds);
    const runA = () => (ta = seconds(timeBatch(reference, referenceRepeat)) / referenceRepeat);
    const runB = () => (tb = seconds(timeBatch(compared, comparedRepeat)) / comparedRepeat);
    if (round % 2 === 0) {
      runA();
      runB();
    } else {
      runB();
      runA();
    }
    a.push((1e9 * ta) / referencePoints);
    b.push((1e9 * tb) / comparedPoints);
    ratios.push(tb / ta);
  }
  return { reference: median(a), compared: median(b), ratio: median(ratios) };
}

/** The dense engine against the semiseparable one, both "build from parameters + evaluate". */
export interface DenseRow {
  readonly components: number;
  readonly n: number;
  readonly semiseparableMs: number;
  readonly denseMs: number;
  readonly speedUp: number;
  readonly relativeDifference: number;
}

export function measureDense(engineCase: EngineCase, data: EngineData, settings: TimingSettings): DenseRow {
  const n = data.time.length;
  const template = engineCase.kernel;
  const values = template.parameterValues;
  const options = { errors: data.errors, mean: data.mean };
  const semiseparable = fullLogLikelihood(engineCase, data);
  const dense = () => new DenseGaussianProcess(template.withParameters(values), data.time, options).logLikelihood(data.value);
  const a = semiseparable();
  const b = dense();
  const timing = timePair(semiseparable, dense, 1, 1, settings);
  return {
    components: engineCase.components,
    n,
    semiseparableMs: timing.reference / 1e6,
    denseMs: timing.compared / 1e6,
    speedUp: timing.ratio,
    relativeDifference: Math.abs(a - b) / Math.abs(b),
  };
}

/** Prediction cost: mean and variance at m new times given n data. */
export interface PredictRow {
  readonly components: number;
  readonly n: number;
  readonly m: number;
  /** ns per data point of one build + logLikelihood. */
  readonly logLikelihood: number;
  /** ns per point of the merged sequence (n + m) of one build + predict. */
  readonly predict: number;
  /** predict time / logLikelihood time, per call. */
  readonly ratio: number;
}

/** `m` requested times on a regular grid over the data's span (gaps included). */
export function predictionGrid(data: EngineData, m: number): Float64Array {
  const start = data.time[0];
  const span = data.time[data.time.length - 1] - start;
  return Float64Array.from({ length: m }, (_, i) => start + (span * (i + 0.5)) / m);
}

export function measurePredict(engineCase: EngineCase, data: EngineData, m: number, settings: TimingSettings): PredictRow {
  const n = data.time.length;
  const template = engineCase.kernel;
  const values = template.parameterValues;
  const options = { errors: data.errors, mean: data.mean };
  const grid = predictionGrid(data, m);
  const likelihood = fullLogLikelihood(engineCase, data);
  const predict = () => {
    const result = new GaussianProcess(template.withParameters(values), data.time, options).given(data.value).at(grid);
    return result.mean[0] + result.variance[m - 1];
  };
  const timing = timePair(likelihood, predict, n, n + m, settings);
  return { components: engineCase.components, n, m, logLikelihood: timing.reference, predict: timing.compared, ratio: timing.ratio };
}
