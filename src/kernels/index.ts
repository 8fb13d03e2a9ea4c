import { KERNEL_FAMILIES } from "./families.js";

export { Kernel, SumKernel, ProductKernel, autocovarianceFromForm } from "./kernel.js";
export { KERNEL_FAMILIES, familyOfExpression, familyOfModel, type ModelName } from "./families.js";
export { parameterUnit, parameterValidity, type AnyKernelFamily, type FamilyParameter, type KernelFamily, type ParameterKind, type ParameterUnit } from "./kernel-family.js";
export { CarmaKernel, type CarmaOscillation, type CarmaParameters } from "./carma.js";
export { DampedRandomWalkKernel, type DampedRandomWalkParameters } from "./damped-random-walk.js";
export { Matern32Kernel, type Matern32Parameters } from "./matern32.js";
export { OscillatorKernel, type OscillatorParameters } from "./oscillator.js";
export { PeriodicSquaredExponentialKernel, type PeriodicSquaredExponentialParameters } from "./periodic-squared-exponential.js";
export { QuasiPeriodicKernel, type QuasiPeriodicParameters } from "./quasi-periodic.js";

/** The `kernels` namespace: one constructor per family of {@link KERNEL_FAMILIES}, under the family's name. */
export type KernelConstructors = {
  readonly [Family in (typeof KERNEL_FAMILIES)[number] as Family["name"]]: Family["create"];
};

/**
 * The kernel families in physical parameters, one constructor per family descriptor (`KERNEL_FAMILIES`,
 * where each family's summary and parameters are listed). Every family rejects invalid parameters with a
 * RangeError naming the parameter and value.
 *
 * @example
 * const rotation = kernels.quasiPeriodic({ sigma: 0.02, period: 11.3, decayTime: 30, harmonicWeight: 0.3 });
 * const trend = kernels.dampedRandomWalk({ sigma: 0.05, tau: 400 });
 * const k = rotation.plus(trend);
 */
export const kernels = Object.fromEntries(KERNEL_FAMILIES.map((family) => [family.name, family.create])) as KernelConstructors;
