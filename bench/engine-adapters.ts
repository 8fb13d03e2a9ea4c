import { summarizeLightCurve } from "../src/models/data-summary.js";
import { buildModel, modelLikelihood, type ModelName } from "../src/models/light-curve-model.js";
import { timePair } from "./engine-companions.js";
import type { TimingSettings } from "./engine-likelihood.js";
import { adapterCases } from "./samplers-gp-models.js";

/** The gradient's cost through the model adapters that NUTS and L-BFGS use (src/models). */
export interface AdapterRow {
  readonly label: string;
  readonly model: ModelName;
  readonly n: number;
  /** ms per call of the adapter's logLikelihood and logLikelihoodAndGradient. */
  readonly valueMs: number;
  readonly gradientMs: number;
  /** Median over rounds of gradient / value time. */
  readonly cost: number;
}

/**
 * Times `modelLikelihood(model, lightCurve)`'s value against its value and gradient at the model's first
 * guess, on the sampler benchmark's simulated light curves (bench/samplers-gp-models.ts): the path a sampler
 * takes (the light curve's inputs checked once, `withKernel` per call, the tape reused).
 */
export function measureAdapters(settings: TimingSettings): AdapterRow[] {
  return adapterCases().map(({ fit, model: name, lightCurve }) => {
    const model = buildModel(name, summarizeLightCurve(lightCurve));
    const likelihood = modelLikelihood(model, lightCurve);
    const x = model.space.physicalFromRecord(model.initialGuess);
    const gradient = new Float64Array(x.length);
    const value = () => likelihood.logLikelihood(x);
    const both = () => likelihood.logLikelihoodAndGradient!(x, gradient);
    for (let i = 0; i < 200; i++) both();
    const timing = timePair(value, both, 1, 1, settings);
    return { label: fit.label, model: name, n: fit.time.length, valueMs: timing.reference / 1e6, gradientMs: timing.compared / 1e6, cost: timing.ratio };
  });
}
