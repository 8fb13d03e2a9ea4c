import { expect } from "vitest";
import type { ConditionedProcess, MeanAndVariance } from "../../src/gp/process-interface.js";
import { maxRelativeDifference } from "./seasonal-times.js";

/** A process that conditions on values (`GaussianProcess`, `DenseGaussianProcess`). */
interface Conditionable {
  given(values: ArrayLike<number>): ConditionedProcess;
}

/**
 * Conditions `engine` and `reference` on the same `values` and expects their predictions at `times` to
 * agree to 1e-9 (relative; variances and covariances with a floor of 1e-3 `variance`, the kernel's
 * variance): means, variances and the joint covariance. Returns both conditioned processes, the engine's
 * prediction and covariance, for further checks.
 */
export function expectSameConditioning(engine: Conditionable, reference: Conditionable, values: ArrayLike<number>, times: ArrayLike<number>, variance: number) {
  const givenEngine = engine.given(values);
  const givenReference = reference.given(values);
  const prediction: MeanAndVariance = givenEngine.at(times);
  const expected = givenReference.at(times);
  expect(maxRelativeDifference(prediction.mean, expected.mean)).toBeLessThan(1e-9);
  expect(maxRelativeDifference(prediction.variance, expected.variance, variance * 1e-3)).toBeLessThan(1e-9);
  const covariance = givenEngine.covarianceAt(times);
  expect(maxRelativeDifference(covariance, givenReference.covarianceAt(times), variance * 1e-3)).toBeLessThan(1e-9);
  return { givenEngine, givenReference, prediction, expected, covariance };
}
