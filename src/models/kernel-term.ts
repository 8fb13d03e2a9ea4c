import type { AnyKernelFamily, Kernel } from "../kernels/index.js";

/**
 * One additive term of a model's kernel, in the model's parameter names. `build` receives the values of
 * `names` in order and returns the kernel, whose own parameters must be in the same order (so that the
 * engine's gradient maps back one to one).
 */
export interface KernelTerm {
  readonly names: readonly string[];
  build(values: readonly number[]): Kernel;
}

/**
 * The term of one kernel family with a fixed parameter list, its parameters named as in the family's
 * descriptor unless `rename` gives model names for them.
 *
 * @example familyTerm(dampedRandomWalkFamily, { sigma: "backgroundSigma", tau: "backgroundTau" })
 */
export function familyTerm(family: AnyKernelFamily, rename: Readonly<Record<string, string>> = {}): KernelTerm {
  const build = family.fromValues;
  if (!build) throw new RangeError(`the ${family.name} family has no fixed parameter list, so it cannot be a model term`);
  return { names: family.parameters.map((p) => rename[p.name] ?? p.name), build };
}
