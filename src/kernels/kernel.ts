import {
  formAutocovariance,
  formPowerSpectrum,
  productOfForms,
  sumOfForms,
  type SemiseparableForm,
} from "../linalg/semiseparable-form.js";

/**
 * A stationary covariance function k(tau) of a Gaussian process, in physical parameters.
 *
 * Conventions: `tau` and every timescale or period are in the input time unit; the power spectral density
 * is two-sided in angular frequency, S(omega) = integral k(tau) exp(-i omega tau) dtau, so that
 * k(tau) = (1 / 2 pi) integral S(omega) exp(i omega tau) domega and k(0) = (1 / 2 pi) integral S.
 *
 * Kernels are immutable values; `plus` and `times` build new kernels, to any depth.
 */
export abstract class Kernel {
  /** Parameter names, in the order of `parameterValues`. */
  abstract readonly parameterNames: readonly string[];
  /** Current parameter values (a copy is returned by implementations; do not mutate). */
  abstract readonly parameterValues: Float64Array;
  /** The same family with new parameter values (validated; throws RangeError). */
  abstract withParameters(values: ArrayLike<number>): Kernel;
  /** k(lag) for one lag. */
  abstract covarianceAt(lag: number): number;
  /** S(omega) for one angular frequency (rad per time unit). */
  abstract spectralDensityAt(omega: number): number;
  /**
   * The semiseparable (state-space) form used by the O(N) engine, or undefined for kernels that have none
   * (those work only with the dense engine).
   */
  abstract semiseparableForm(): SemiseparableForm | undefined;

  /** k(tau) at each lag. */
  autocovariance(lags: ArrayLike<number>): Float64Array {
    const out = new Float64Array(lags.length);
    for (let i = 0; i < lags.length; i++) out[i] = this.covarianceAt(lags[i]);
    return out;
  }

  /** S(omega) at each angular frequency. */
  psd(angularFrequencies: ArrayLike<number>): Float64Array {
    const out = new Float64Array(angularFrequencies.length);
    for (let i = 0; i < angularFrequencies.length; i++) out[i] = this.spectralDensityAt(angularFrequencies[i]);
    return out;
  }

  /** The variance k(0). */
  get variance(): number {
    return this.covarianceAt(0);
  }

  /** The kernel of the sum of two independent processes: k = k_a + k_b. Parameters: "0.<name>", "1.<name>". */
  plus(other: Kernel): Kernel {
    return new SumKernel(this, other);
  }

  /** The product kernel k = k_a k_b. Parameters: "0.<name>", "1.<name>". */
  times(other: Kernel): Kernel {
    return new ProductKernel(this, other);
  }
}

/** Shared machinery of sums and products: parameters of both operands, prefixed "0." and "1.". */
abstract class CombinedKernel extends Kernel {
  readonly parameterNames: readonly string[];
  private cachedForm?: SemiseparableForm | null;

  constructor(
    readonly first: Kernel,
    readonly second: Kernel,
  ) {
    super();
    this.parameterNames = [
      ...first.parameterNames.map((name) => `0.${name}`),
      ...second.parameterNames.map((name) => `1.${name}`),
    ];
  }

  get parameterValues(): Float64Array {
    const a = this.first.parameterValues;
    const b = this.second.parameterValues;
    const out = new Float64Array(a.length + b.length);
    out.set(a, 0);
    out.set(b, a.length);
    return out;
  }

  /** The combined form, built once (kernels are immutable). */
  semiseparableForm(): SemiseparableForm | undefined {
    if (this.cachedForm === undefined) {
      const a = this.first.semiseparableForm();
      const b = this.second.semiseparableForm();
      this.cachedForm = a && b ? this.combineForms(a, b) : null;
    }
    return this.cachedForm ?? undefined;
  }

  protected abstract combineForms(a: SemiseparableForm, b: SemiseparableForm): SemiseparableForm;

  protected splitValues(values: ArrayLike<number>): [Kernel, Kernel] {
    const split = this.first.parameterNames.length;
    const all = Array.from(values);
    if (all.length !== this.parameterNames.length) {
      throw new RangeError(`expected ${this.parameterNames.length} parameter values, got ${all.length}`);
    }
    return [this.first.withParameters(all.slice(0, split)), this.second.withParameters(all.slice(split))];
  }
}

/** k_a + k_b: the covariance of the sum of two independent processes. */
export class SumKernel extends CombinedKernel {
  withParameters(values: ArrayLike<number>): Kernel {
    const [a, b] = this.splitValues(values);
    return new SumKernel(a, b);
  }

  covarianceAt(lag: number): number {
    return this.first.covarianceAt(lag) + this.second.covarianceAt(lag);
  }

  spectralDensityAt(omega: number): number {
    return this.first.spectralDensityAt(omega) + this.second.spectralDensityAt(omega);
  }

  protected combineForms(a: SemiseparableForm, b: SemiseparableForm): SemiseparableForm {
    return sumOfForms(a, b);
  }
}

/**
 * k_a k_b. Its power spectrum is the convolution of the factors' spectra; for semiseparable factors it is
 * computed exactly from the state-space form (S = 2 Re p^T (i omega - F)^{-1} q), otherwise by quadrature.
 */
export class ProductKernel extends CombinedKernel {
  withParameters(values: ArrayLike<number>): Kernel {
    const [a, b] = this.splitValues(values);
    return new ProductKernel(a, b);
  }

  covarianceAt(lag: number): number {
    return this.first.covarianceAt(lag) * this.second.covarianceAt(lag);
  }

  spectralDensityAt(omega: number): number {
    const form = this.semiseparableForm();
    if (form) return formPowerSpectrum(form, omega);
    return spectrumByQuadrature(this, omega);
  }

  protected combineForms(a: SemiseparableForm, b: SemiseparableForm): SemiseparableForm {
    return productOfForms(a, b);
  }
}

/** Autocovariance of any semiseparable kernel from its form (a cross-check of the closed forms). */
export function autocovarianceFromForm(kernel: Kernel, lag: number): number {
  const form = kernel.semiseparableForm();
  if (!form) throw new Error("kernel has no semiseparable form");
  return formAutocovariance(form, lag);
}

/**
 * S(omega) = 2 integral_0^inf k(tau) cos(omega tau) dtau by composite Simpson quadrature on [0, T] with T where
 * the kernel has decayed below 1e-14 of its variance (only for kernels without a closed form).
 */
function spectrumByQuadrature(kernel: Kernel, omega: number): number {
  const variance = kernel.covarianceAt(0);
  let horizon = 1;
  while (Math.abs(kernel.covarianceAt(horizon)) > 1e-14 * variance && horizon < 1e12) horizon *= 2;
  const steps = 20000;
  const h = horizon / steps;
  let total = kernel.covarianceAt(0) + kernel.covarianceAt(horizon) * Math.cos(omega * horizon);
  for (let i = 1; i < steps; i++) {
    const tau = i * h;
    total += (i % 2 === 1 ? 4 : 2) * kernel.covarianceAt(tau) * Math.cos(omega * tau);
  }
  return (2 * h * total) / 3;
}
