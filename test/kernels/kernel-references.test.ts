import { describe, expect, it } from "vitest";
import { autocovarianceFromForm, kernels, type Kernel } from "../../src/kernels/index.js";
import { formPowerSpectrum } from "../../src/linalg/semiseparable-form.js";
import { simpson } from "../helpers/quadrature.js";

const families: Array<[string, Kernel]> = [
  ["damped random walk", kernels.dampedRandomWalk({ sigma: 0.3, tau: 12 })],
  ["oscillator Q = 5", kernels.oscillator({ sigma: 0.2, period: 7, quality: 5 })],
  ["oscillator Q = 0.3", kernels.oscillator({ sigma: 0.2, period: 9, quality: 0.3 })],
  ["oscillator Q = 1/2", kernels.oscillator({ sigma: 0.2, period: 9, quality: 0.5 })],
  ["quasi-periodic", kernels.quasiPeriodic({ sigma: 0.1, period: 6, decayTime: 5.7, harmonicWeight: 0.4 })],
  ["matern32", kernels.matern32({ sigma: 0.15, scale: 4 })],
  ["sum", kernels.matern32({ sigma: 0.15, scale: 4 }).plus(kernels.dampedRandomWalk({ sigma: 0.1, tau: 20 }))],
  ["carma(3, 1)", kernels.carma({ sigma: 0.2, oscillations: [{ period: 9, quality: 4 }], timescales: [15], movingAverage: [2] })],
  ["product", kernels.oscillator({ sigma: 0.5, period: 8, quality: 2 }).times(kernels.dampedRandomWalk({ sigma: 0.4, tau: 30 }))],
];

describe("kernel autocovariance and power spectrum", () => {
  // Wiener-Khinchin theorem: k(tau) = (1 / pi) integral_0^inf S(omega) cos(omega tau) domega for the two-sided
  // angular-frequency PSD of an even kernel (e.g. Rasmussen & Williams 2006, eq. 4.6).
  for (const [name, kernel] of families) {
    it(`${name}: a numerical Fourier transform of the PSD reproduces the autocovariance`, () => {
      const variance = kernel.variance;
      for (const lag of [0, 0.7, 3, 11]) {
        // Spectra fall at least as omega^-2: truncating at 2000 rad per time unit leaves at most
        // 2 sigma^2 / (pi tau 2000) < 3e-5 of the variance (damped random walk, lag 0).
        const integral = simpson((w) => kernel.spectralDensityAt(w) * Math.cos(w * lag), 0, 2000, 400_000) / Math.PI;
        expect(Math.abs(integral - kernel.covarianceAt(lag))).toBeLessThan(1e-4 * variance);
      }
    });

    it(`${name}: the state-space form agrees with the closed form`, () => {
      for (const lag of [0, 0.01, 0.5, 2, 9.5, 40]) {
        expect(Math.abs(autocovarianceFromForm(kernel, lag) - kernel.covarianceAt(lag))).toBeLessThan(1e-14 * kernel.variance + 1e-300);
      }
      const form = kernel.semiseparableForm()!;
      for (const w of [0, 0.1, 0.9, 3, 30]) {
        const closed = kernel.spectralDensityAt(w);
        expect(Math.abs(formPowerSpectrum(form, w) - closed)).toBeLessThan(1e-12 * Math.max(closed, 1e-300));
      }
    });
  }

  it("damped random walk: structure function SF^2 = 2 sigma^2 (1 - exp(-dt/tau)) (MacLeod et al. 2010, ApJ 721, 1014, eq. 4)", () => {
    const sigma = 0.25;
    const tau = 180;
    const k = kernels.dampedRandomWalk({ sigma, tau });
    for (const dt of [1, 30, 180, 1000, 1e5]) {
      const sf2 = 2 * (k.covarianceAt(0) - k.covarianceAt(dt));
      expect(sf2).toBeCloseTo(2 * sigma * sigma * (1 - Math.exp(-dt / tau)), 14);
    }
    // SF_inf = sqrt(2) sigma at long lags.
    expect(Math.sqrt(2 * (k.covarianceAt(0) - k.covarianceAt(1e6)))).toBeCloseTo(Math.SQRT2 * sigma, 14);
  });

  it("oscillator: PSD peak S(w0) = 2 sigma^2 Q / w0 and variance (1/2pi) integral S = sigma^2 (Anderson et al. 1990, ApJ 364, 699)", () => {
    for (const quality of [0.8, 3, 25]) {
      const sigma = 0.3;
      const period = 4;
      const w0 = (2 * Math.PI) / period;
      const k = kernels.oscillator({ sigma, period, quality });
      expect(k.spectralDensityAt(w0)).toBeCloseTo((2 * sigma * sigma * quality) / w0, 12);
      // The area under a sharp resonance needs a fine grid around w0.
      // The tail beyond 2000 rad per time unit falls as omega^-4 and is negligible.
      const area = (2 * simpson((w) => k.spectralDensityAt(w), 0, 2000, 400_000)) / (2 * Math.PI);
      expect(Math.abs(area - sigma * sigma)).toBeLessThan(1e-5 * sigma * sigma);
    }
  });

  it("oscillator: every damping regime matches the formula of docs/architecture.md (Public library API), and Q within 1e-8 of 1/2 matches the critical limit", () => {
    const sigma = 1.3;
    const period = 5;
    const w0 = (2 * Math.PI) / period;
    const design = (quality: number, t: number) => {
      if (quality > 0.5) {
        const eta = Math.sqrt(1 - 1 / (4 * quality * quality));
        return sigma ** 2 * Math.exp((-w0 * t) / (2 * quality)) * (Math.cos(eta * w0 * t) + Math.sin(eta * w0 * t) / (2 * eta * quality));
      }
      const eta = Math.sqrt(1 / (4 * quality * quality) - 1);
      return sigma ** 2 * Math.exp((-w0 * t) / (2 * quality)) * (Math.cosh(eta * w0 * t) + Math.sinh(eta * w0 * t) / (2 * eta * quality));
    };
    for (const quality of [0.05, 0.3, 0.45, 0.7, 2, 40]) {
      const k = kernels.oscillator({ sigma, period, quality });
      for (const t of [0.1, 1, 4, 12]) expect(Math.abs(k.covarianceAt(t) - design(quality, t))).toBeLessThan(1e-12 * sigma ** 2);
    }
    // Critical damping: sigma^2 exp(-w0 t)(1 + w0 t). Within 1e-8 of Q = 1/2 the kernel moves by O(1e-8)
    // only; the naive formula loses about half the digits there, the engine does not.
    const critical = (t: number) => sigma ** 2 * Math.exp(-w0 * t) * (1 + w0 * t);
    for (const t of [0, 0.3, 2, 10]) {
      expect(kernels.oscillator({ sigma, period, quality: 0.5 }).covarianceAt(t)).toBeCloseTo(critical(t), 14);
      for (const quality of [0.5 + 1e-8, 0.5 - 1e-8]) {
        const value = kernels.oscillator({ sigma, period, quality }).covarianceAt(t);
        expect(Math.abs(value - critical(t))).toBeLessThan(1e-7 * sigma ** 2);
      }
      // Continuity to first order: k(Q = 1/2 + e) - k(1/2) is linear in e.
      const d1 = kernels.oscillator({ sigma, period, quality: 0.5 + 1e-8 }).covarianceAt(t) - critical(t);
      const d2 = kernels.oscillator({ sigma, period, quality: 0.5 + 2e-8 }).covarianceAt(t) - critical(t);
      if (t > 0) expect(Math.abs(d2 / d1 - 2)).toBeLessThan(1e-4);
    }
  });

  it("matern32 is exactly (1 + sqrt(3) t / l) exp(-sqrt(3) t / l) (Rasmussen & Williams 2006, eq. 4.17)", () => {
    const k = kernels.matern32({ sigma: 2, scale: 3 });
    for (const t of [0, 0.5, 3, 20]) {
      const x = (Math.sqrt(3) * t) / 3;
      expect(k.covarianceAt(t)).toBeCloseTo(4 * (1 + x) * Math.exp(-x), 14);
    }
  });

  it("rejects invalid parameters with a RangeError naming the parameter and value", () => {
    expect(() => kernels.dampedRandomWalk({ sigma: -1, tau: 3 })).toThrow(/sigma.*-1/);
    expect(() => kernels.dampedRandomWalk({ sigma: 1, tau: 0 })).toThrow(RangeError);
    expect(() => kernels.oscillator({ sigma: 1, period: NaN, quality: 1 })).toThrow(/period.*NaN/);
    expect(() => kernels.oscillator({ sigma: 1, period: 2, quality: -0.1 })).toThrow(/quality.*-0.1/);
    expect(() => kernels.matern32({ sigma: 1, scale: Infinity })).toThrow(/scale.*Infinity/);
    expect(() => kernels.periodicSquaredExponential({ sigma: 1, period: 2, scale: 1, gamma: 0 })).toThrow(/gamma.*0/);
  });
});

describe("squared-exponential times periodic kernel (dense only)", () => {
  it("its Bessel-series spectrum transforms back to the kernel (Abramowitz & Stegun 9.6.34)", () => {
    const k = kernels.periodicSquaredExponential({ sigma: 0.5, period: 3, scale: 8, gamma: 2 });
    for (const lag of [0, 1, 1.5, 6]) {
      const integral = simpson((w) => k.spectralDensityAt(w) * Math.cos(w * lag), 0, 60, 200_000) / Math.PI;
      expect(Math.abs(integral - k.covarianceAt(lag))).toBeLessThan(1e-9);
    }
    expect(k.semiseparableForm()).toBeUndefined();
  });
});
