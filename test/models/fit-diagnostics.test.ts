import { describe, expect, it } from "vitest";
import { fitSummaryText } from "../../src/cli/fit-summary-text.js";
import { UsageError } from "../../src/errors/usage-error.js";
import { GaussianProcess } from "../../src/gp/gaussian-process.js";
import { assessConvergence } from "../../src/inference/convergence-check.js";
import { kernels } from "../../src/kernels/index.js";
import { seasonalGroundCadence } from "../../src/lightcurve/cadence.js";
import { observeMagnitudes } from "../../src/lightcurve/simulated-photometry.js";
import { combinedDiagnostics } from "../../src/models/fit-diagnostics.js";
import { fitLightCurveDetailed, type DetailedFit } from "../../src/models/fit-light-curve.js";
import type { FitResult } from "../../src/models/fit-result.js";
import { fitWarnings } from "../../src/models/fit-warnings.js";
import { reportWarnings } from "../../src/report/html-report.js";
import { plainSummary } from "../../src/report/plain-summary.js";
import { reportInputFromFit } from "../../src/report/report-from-fit.js";
import { createRng } from "../../src/random/rng.js";
import type { MethodPosterior } from "../../src/inference/index.js";

/**
 * Honest diagnostics (issue 12): a run that printed "R-hat max NaN, ESS min NaN" in the summary, said
 * `converged: true` in the JSON, warned that no draws were kept and wrote "The sampler converged: the
 * largest R-hat is NaN" in the report. Each failure is built here and the four outputs (JSON, warnings,
 * summary text, report) must agree that the fit did not converge. The criteria are those of Vehtari et
 * al. 2021 (R-hat, bulk and tail ESS >= 400) as implemented in convergence-check.ts.
 */
const rng = createRng("honest-diagnostics");
const time = seasonalGroundCadence({ seasons: 2, revisitInterval: 4 }, rng);
const truth = new GaussianProcess(kernels.dampedRandomWalk({ sigma: 0.2, tau: 30 }), time, { mean: 18 }).priorDraw(rng);
const lightCurve = observeMagnitudes(time, truth, { depth5Sigma: 22 }, rng, "honest diagnostics");

/** An MCMC fit (these are MCMC failure modes; importance sampling's own are tested in test/inference). */
function fitWith(maxEvaluations: number): DetailedFit {
  return fitLightCurveDetailed(lightCurve, { model: "drw", seed: 1, maxEvaluations, method: "mcmc", clock: () => 0 });
}

/** The four outputs of a result, as text. */
function outputs(fit: DetailedFit, result: FitResult = fit.result) {
  const input = { ...reportInputFromFit(fit.conditioning, result, fit.model, { gridPoints: 50, draws: 10 }), result };
  return { json: JSON.parse(JSON.stringify(result)) as FitResult, summary: fitSummaryText(result), report: plainSummary(input).join(" "), reportWarnings: reportWarnings(input) };
}

function expectAllSayNotConverged(o: ReturnType<typeof outputs>) {
  expect(o.json.diagnostics.converged).toBe(false);
  expect(o.json.warnings.some((w) => /before convergence/.test(w))).toBe(true);
  expect(o.summary).toMatch(/NOT converged/);
  expect(o.summary).not.toMatch(/NaN/);
  expect(o.report).toMatch(/did not converge/);
  expect(o.report).not.toMatch(/NaN|The sampler converged/);
  expect(o.reportWarnings.some((w) => /converge/.test(w))).toBe(true);
}

describe("honest diagnostics", () => {
  it("no kept draws: a one-line UsageError, never summaries of nothing", () => {
    expect(() => fitWith(500)).toThrow(UsageError);
    expect(() => fitWith(500)).toThrow(/no posterior draws were kept.*--max-evaluations/);
  });

  it("too few draws to compute R-hat: not converged, 'not computed' rather than NaN, all four outputs agree", () => {
    const fit = fitWith(1150);
    const d = fit.result.diagnostics;
    expect(d.keptDraws).toBeGreaterThan(0);
    expect(Number.isFinite(d.rhatMax)).toBe(false);
    const o = outputs(fit);
    expectAllSayNotConverged(o);
    expect(o.summary).toMatch(/R-hat max not computed/);
    expect(o.json.warnings.some((w) => /too few to compute R-hat/.test(w))).toBe(true);
  }, 120_000);

  it("budget exhausted with draws: not converged in all four outputs", () => {
    const fit = fitWith(4000);
    expect(fit.result.diagnostics.stopReason).toBe("budget");
    expect(Number.isFinite(fit.result.diagnostics.rhatMax)).toBe(true);
    expectAllSayNotConverged(outputs(fit));
  }, 120_000);

  it("stuck walkers (a quarter of the chains never move): not converged in all four outputs", () => {
    const fit = fitWith(4000);
    // 16 chains of 400 draws; four are stuck at one value away from the others.
    const chainRng = createRng("stuck");
    const chains = Array.from({ length: 16 }, (_, c) => Float64Array.from({ length: 400 }, () => (c < 4 ? 3 : chainRng.normal())));
    const report = assessConvergence([chains]);
    expect(report.converged).toBe(false);
    const run = fit.runs[0];
    const stuck = {
      ...run,
      diagnostics: { ...run.diagnostics, stopReason: "budget", converged: false, rhatMax: report.rhatMax, essMin: report.essMin, autocorrelationTime: report.autocorrelationTime },
    } as MethodPosterior;
    const diagnostics = combinedDiagnostics([stuck], 0);
    expect(diagnostics.converged).toBe(false);
    const warnings = fitWarnings({ model: fit.model, summary: fit.summary, lightCurve, parameters: fit.result.parameters, diagnostics, modes: [] });
    expectAllSayNotConverged(outputs(fit, { ...fit.result, diagnostics, warnings }));
  }, 120_000);

  it("a run that claims convergence with a NaN figure is not converged when combined", () => {
    const fit = fitWith(4000);
    const run = fit.runs[0];
    const claimed = { ...run, diagnostics: { ...run.diagnostics, stopReason: "converged", converged: true, essMin: NaN } } as MethodPosterior;
    expect(combinedDiagnostics([claimed], 0).converged).toBe(false);
    expect(combinedDiagnostics([claimed, claimed], 0).rhatMax).toBe(run.diagnostics.rhatMax);
  }, 120_000);
});
