import { kernels, type Kernel } from "../kernels/index.js";

/**
 * One additive term of a model's kernel, in the model's parameter names. `build` receives the values of
 * `names` in order and returns the kernel, whose own parameters must be in the same order (so that the
 * engine's gradient maps back one to one).
 */
export interface KernelTerm {
  readonly names: readonly string[];
  build(values: readonly number[]): Kernel;
}

/** sigma^2 exp(-|t|/tau) with parameters named `<sigma>`, `<tau>`. */
export function dampedRandomWalkTerm(sigma = "sigma", tau = "tau"): KernelTerm {
  return { names: [sigma, tau], build: ([s, t]) => kernels.dampedRandomWalk({ sigma: s, tau: t }) };
}

/** The driven damped oscillator with parameters sigma, period, quality. */
export function oscillatorTerm(): KernelTerm {
  return {
    names: ["sigma", "period", "quality"],
    build: ([sigma, period, quality]) => kernels.oscillator({ sigma, period, quality }),
  };
}

/** The quasi-periodic rotation kernel with parameters sigma, period, decayTime, harmonicWeight. */
export function quasiPeriodicTerm(): KernelTerm {
  return {
    names: ["sigma", "period", "decayTime", "harmonicWeight"],
    build: ([sigma, period, decayTime, harmonicWeight]) => kernels.quasiPeriodic({ sigma, period, decayTime, harmonicWeight }),
  };
}
