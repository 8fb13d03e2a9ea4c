import { describe, expect, it } from "vitest";
import { autocovarianceFromForm, kernels } from "../../src/kernels/index.js";
import { formCovarianceDerivatives, formPowerSpectrum } from "../../src/linalg/semiseparable-form.js";
import { centralDifference } from "../helpers/central-difference.js";
import { simpson } from "../helpers/quadrature.js";

// Parameter sets from a coherence time of a hundredth of a period to ten thousand periods, with all the
// variance in the fundamental, in the harmonic, and shared.
const cases = [
  { sigma: 0.1, period: 6, decayTime: 5.7, harmonicWeight: 0.4 },
  { sigma: 0.02, period: 11.3, decayTime: 40, harmonicWeight: 0 },
  { sigma: 1.3, period: 0.37, decayTime: 0.0037, harmonicWeight: 1 },
  { sigma: 0.5, period: 25, decayTime: 2.5e5, harmonicWeight: 0.7 },
];

/** The kernel as written in the project's docs (docs/choosing-a-kernel.md), evaluated independently. */
function documentedKernel(p: (typeof cases)[number], t: number): number {
  const c = (w: number) => Math.cos(w * t) + Math.sin(w * Math.abs(t)) / (w * p.decayTime);
  const w = (2 * Math.PI) / p.period;
  return p.sigma ** 2 * Math.exp(-Math.abs(t) / p.decayTime) * ((1 - p.harmonicWeight) * c(w) + p.harmonicWeight * c(2 * w));
}

describe("quasi-periodic kernel", () => {
  it("autocovariance is the documented closed form, at positive and negative lags", () => {
    for (const p of cases) {
      const k = kernels.quasiPeriodic(p);
      const lags = [0, 1e-6, 0.01, 0.3, 1, 2.5, 7, 19, 60, 400, -3.3].map((x) => x * p.period);
      const values = k.autocovariance(lags);
      lags.forEach((lag, i) => expect(Math.abs(values[i] - documentedKernel(p, lag))).toBeLessThan(1e-14 * p.sigma ** 2));
      expect(k.variance).toBeCloseTo(p.sigma ** 2, 15);
    }
  });

  it("each term is the driven damped oscillator with w0 = sqrt(w^2 + 1/decayTime^2), Q = w0 decayTime / 2 (Anderson et al. 1990, ApJ 364, 699)", () => {
    for (const p of cases) {
      for (const [weight, multiple] of [[0, 1], [1, 2]] as const) {
        const single = kernels.quasiPeriodic({ ...p, harmonicWeight: weight });
        const w = (multiple * 2 * Math.PI) / p.period;
        const w0 = Math.hypot(w, 1 / p.decayTime);
        const quality = (w0 * p.decayTime) / 2;
        // The quality of the fundamental: Q = sqrt((pi decayTime / period)^2 + 1/4), about pi decayTime / period.
        if (multiple === 1) expect(quality).toBeCloseTo(Math.sqrt((Math.PI * p.decayTime / p.period) ** 2 + 0.25), 9);
        const oscillator = kernels.oscillator({ sigma: p.sigma, period: (2 * Math.PI) / w0, quality });
        for (const lag of [0, 0.2, 1, 3.7, 12].map((x) => x * p.period)) {
          expect(Math.abs(single.covarianceAt(lag) - oscillator.covarianceAt(lag))).toBeLessThan(1e-11 * p.sigma ** 2);
        }
        for (const omega of [0, 0.5 * w, w, 1.5 * w, 10 * w]) {
          const reference = oscillator.spectralDensityAt(omega);
          expect(Math.abs(single.spectralDensityAt(omega) - reference)).toBeLessThan(1e-9 * reference);
        }
      }
    }
  });

  it("Wiener-Khinchin: the PSD transforms back to the autocovariance (Rasmussen & Williams 2006, eq. 4.6)", () => {
    for (const p of cases.slice(0, 2)) {
      const k = kernels.quasiPeriodic(p);
      const w = (2 * Math.PI) / p.period;
      for (const lag of [0, 0.3, 1, 2.2].map((x) => x * p.period)) {
        // The spectrum falls as omega^-4 beyond 2w: the tail past 200 w holds < 1e-7 of the variance; the
        // grid resolves the resonance width 1 / decayTime with > 100 points.
        const integral = simpson((omega) => k.spectralDensityAt(omega) * Math.cos(omega * lag), 0, 200 * w, 400_000) / Math.PI;
        expect(Math.abs(integral - k.covarianceAt(lag))).toBeLessThan(1e-6 * k.variance);
      }
    }
  });

  it("the state-space form reproduces the closed form and the spectrum in every regime", () => {
    for (const p of cases) {
      const k = kernels.quasiPeriodic(p);
      for (const lag of [0, 0.01, 0.5, 2, 9.5, 40].map((x) => x * p.period)) {
        expect(Math.abs(autocovarianceFromForm(k, lag) - k.covarianceAt(lag))).toBeLessThan(1e-13 * k.variance);
      }
      const form = k.semiseparableForm()!;
      const w = (2 * Math.PI) / p.period;
      for (const omega of [0, 0.1 * w, w, 2 * w, 30 * w]) {
        const closed = k.spectralDensityAt(omega);
        expect(Math.abs(formPowerSpectrum(form, omega) - closed)).toBeLessThan(1e-10 * closed);
      }
    }
  });

  it("its two blocks oscillate at exactly period and period / 2 and decay at 1 / decayTime", () => {
    const k = kernels.quasiPeriodic({ sigma: 1, period: 11.3, decayTime: 9, harmonicWeight: 0.3 });
    for (const [i, block] of k.semiseparableForm()!.blocks.entries()) {
      // Eigenvalues of a 2 x 2 drift: tr / 2 +/- i sqrt(4 det - tr^2) / 2 (common practice).
      const [a, b, c, d] = block.generator;
      const tr = a + d;
      const det = a * d - b * c;
      expect((2 * Math.PI) / (Math.sqrt(4 * det - tr * tr) / 2)).toBeCloseTo(11.3 / (i + 1), 12);
      expect(-tr / 2).toBeCloseTo(1 / 9, 14);
    }
  });

  it("the derivatives of k(lag) agree with central differences for every parameter", () => {
    // Reference: the symmetric difference quotient, truncation error O(h^2).
    for (const p of cases.slice(0, 3)) {
      const k = kernels.quasiPeriodic({ ...p, harmonicWeight: Math.min(Math.max(p.harmonicWeight, 0.1), 0.9) });
      const theta = k.parameterValues;
      for (const lag of [0.3, 1.7, 6].map((x) => x * p.period)) {
        const exact = formCovarianceDerivatives(k.semiseparableForm()!, lag);
        for (let c = 0; c < theta.length; c++) {
          const fd = centralDifference((shifted) => k.withParameters(shifted).covarianceAt(lag), theta, c, 1e-6);
          expect(Math.abs(exact[c] - fd)).toBeLessThan(1e-6 * (Math.abs(fd) + k.variance / theta[c]));
        }
      }
    }
  });

  it("rejects invalid parameters with a RangeError naming the parameter and value", () => {
    const good = { sigma: 1, period: 2, decayTime: 5, harmonicWeight: 0.2 };
    expect(() => kernels.quasiPeriodic({ ...good, sigma: 0 })).toThrow(/sigma.*0/);
    expect(() => kernels.quasiPeriodic({ ...good, period: -2 })).toThrow(/period.*-2/);
    expect(() => kernels.quasiPeriodic({ ...good, decayTime: 0 })).toThrow(/decayTime.*0/);
    expect(() => kernels.quasiPeriodic({ ...good, decayTime: NaN })).toThrow(/decayTime.*NaN/);
    expect(() => kernels.quasiPeriodic({ ...good, harmonicWeight: 1.2 })).toThrow(/harmonicWeight.*1.2/);
    expect(() => kernels.quasiPeriodic({ ...good, harmonicWeight: -0.1 })).toThrow(RangeError);
    expect(kernels.quasiPeriodic({ ...good, harmonicWeight: 0 }).variance).toBe(1);
    expect(kernels.quasiPeriodic({ ...good, harmonicWeight: 1 }).variance).toBe(1);
  });
});
