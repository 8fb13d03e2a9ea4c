import { carmaFamily } from "./carma.js";
import { dampedRandomWalkFamily } from "./damped-random-walk.js";
import type { AnyKernelFamily } from "./kernel-family.js";
import { matern32Family } from "./matern32.js";
import { oscillatorFamily } from "./oscillator.js";
import { periodicSquaredExponentialFamily } from "./periodic-squared-exponential.js";
import { quasiPeriodicFamily } from "./quasi-periodic.js";

/**
 * Every kernel family's descriptor (each in its family's file). The `kernels` namespace, the CLI's kernel
 * expressions, the models of the trade and their parameter lists are all read from this list: a new
 * family is its file plus one entry here.
 */
export const KERNEL_FAMILIES = [
  dampedRandomWalkFamily,
  oscillatorFamily,
  quasiPeriodicFamily,
  matern32Family,
  carmaFamily,
  periodicSquaredExponentialFamily,
] as const;

/** The names of the models of the trade, one per family that declares a model (`fit --model NAME`). */
export type ModelName = NonNullable<(typeof KERNEL_FAMILIES)[number]["model"]>["name"];

/** The family a model of the trade is built on. */
export function familyOfModel(model: ModelName): AnyKernelFamily {
  const family = (KERNEL_FAMILIES as readonly AnyKernelFamily[]).find((f) => f.model?.name === model);
  if (!family) throw new RangeError(`no kernel family declares the model "${String(model)}"`);
  return family;
}

/** The family with a given name in CLI kernel expressions, or undefined. */
export function familyOfExpression(name: string): AnyKernelFamily | undefined {
  return (KERNEL_FAMILIES as readonly AnyKernelFamily[]).find((f) => f.expressionName === name);
}
