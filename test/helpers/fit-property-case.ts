import fc from "fast-check";
import { InputError } from "../../src/errors/input-error.js";
import { UsageError } from "../../src/errors/usage-error.js";
import { parseDelimitedLightCurves } from "../../src/lightcurve/delimited-light-curve.js";
import { fitLightCurve } from "../../src/models/fit-light-curve.js";
import type { FitResult } from "../../src/models/fit-result.js";
import type { ModelName } from "../../src/models/light-curve-model.js";
import { createRng } from "../../src/random/rng.js";

/** One generated light curve and how to fit it (issue 12, item 7). */
export interface FitCase {
  readonly cadence: "clustered" | "single-season" | "gapped" | "repeated-unsorted" | "even";
  readonly n: number;
  readonly unit: "mag" | "flux";
  /** log10 of the typical error (errors from 1e-6 to 10 in the values' unit). */
  readonly logError: number;
  readonly outliers: number;
  /** 0, or 2.46e6 for Julian dates. */
  readonly timeOffset: number;
  readonly model: ModelName;
  readonly robust: boolean;
  readonly seed: number;
}

/** Generated fit cases with N up to `maximumPoints`. */
export function fitCases(maximumPoints: number): fc.Arbitrary<FitCase> {
  return fc.record({
    cadence: fc.constantFrom("clustered", "single-season", "gapped", "repeated-unsorted", "even"),
    n: fc.integer({ min: 3, max: maximumPoints }),
    unit: fc.constantFrom("mag", "flux"),
    logError: fc.double({ min: -6, max: 1, noNaN: true }),
    outliers: fc.integer({ min: 0, max: 3 }),
    timeOffset: fc.constantFrom(0, 2.46e6),
    model: fc.constantFrom<ModelName>("drw", "oscillator", "quasi-periodic"),
    robust: fc.boolean(),
    seed: fc.integer({ min: 0, max: 1e6 }),
  });
}

function times(c: FitCase, rng: ReturnType<typeof createRng>): number[] {
  const out: number[] = [];
  for (let i = 0; out.length < c.n; i++) {
    if (c.cadence === "even") out.push(i * 0.02);
    else if (c.cadence === "single-season") out.push(200 * rng.uniform());
    else if (c.cadence === "gapped") out.push(365.25 * Math.floor(3 * rng.uniform()) + 150 * rng.uniform());
    else if (c.cadence === "clustered") {
      const night = Math.floor(600 * rng.uniform());
      for (let v = 0; v < 3 && out.length < c.n; v++) out.push(night + 0.3 * rng.uniform() + v * 0.01);
    } else {
      const t = 300 * rng.uniform();
      out.push(t);
      if (rng.uniform() < 0.3 && out.length < c.n) out.push(t);
    }
  }
  if (c.cadence !== "repeated-unsorted") out.sort((a, b) => a - b);
  return out.map((t) => t + c.timeOffset);
}

/** The CSV text of a generated case: a damped random walk plus a sinusoid, with errors and outliers. */
export function caseCsv(c: FitCase): string {
  const rng = createRng(`fit-property:${c.seed}`);
  const t = times(c, rng);
  const error = 10 ** c.logError;
  const signalScale = Math.max(0.1, 5 * error);
  let walk = 0;
  const rows = [c.unit === "mag" ? "time,mag,mag_err" : "time,flux,flux_err"];
  for (let i = 0; i < t.length; i++) {
    walk = 0.9 * walk + 0.3 * rng.normal();
    let value = signalScale * (walk + Math.sin((2 * Math.PI * t[i]) / 7.3)) + error * rng.normal();
    if (i < c.outliers) value += signalScale * (8 + 20 * rng.uniform());
    const shown = c.unit === "mag" ? 18 + value : 1000 * (1 + 0.05 * value / signalScale) + value;
    rows.push(`${t[i]},${shown},${error * (0.5 + rng.uniform())}`);
  }
  return rows.join("\n") + "\n";
}

/** How one case ended. */
export type CaseOutcome =
  | { readonly kind: "result"; readonly result: FitResult }
  | { readonly kind: "one-line error"; readonly message: string }
  | { readonly kind: "failure"; readonly message: string };

/** Reads and fits one case; a result must have finite summaries, an error must be a one-line InputError or UsageError. */
export function runCase(c: FitCase, maxEvaluations: number): CaseOutcome {
  try {
    const { lightCurves } = parseDelimitedLightCurves(caseCsv(c), "property.csv");
    const result = fitLightCurve(lightCurves[0], { model: c.model, seed: c.seed, robust: c.robust, maxEvaluations, clock: () => 0 });
    const problems = resultProblems(result);
    return problems.length === 0 ? { kind: "result", result } : { kind: "failure", message: problems.join("; ") };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    if ((error instanceof InputError || error instanceof UsageError) && !message.includes("\n") && !/internal error/.test(message)) {
      return { kind: "one-line error", message };
    }
    return { kind: "failure", message: `${error instanceof Error ? error.name : "thrown"}: ${message}` };
  }
}

function resultProblems(result: FitResult): string[] {
  const problems: string[] = [];
  for (const [group, summaries] of [["parameters", result.parameters], ["derived", result.derived]] as const) {
    for (const [name, s] of Object.entries(summaries)) {
      for (const key of ["median", "q2.5", "q97.5"] as const) if (!Number.isFinite(s[key])) problems.push(`${group}.${name}.${key} = ${s[key]}`);
    }
  }
  const d = result.diagnostics;
  const flagged = result.warnings.some((w) => /too few to compute R-hat/.test(w));
  // The figures that decide convergence depend on the method (docs/diagnostics.md): R-hat and ESS for
  // the Markov chains; k-hat and the weights' ESS for importance sampling, where R-hat is null by design.
  const chainsComputed = Number.isFinite(d.rhatMax) && Number.isFinite(d.essMin);
  const weightsComputed = Number.isFinite(d.paretoK) && Number.isFinite(d.essMin);
  const computed = d.method === "importance" ? weightsComputed : d.method === "mixed" ? chainsComputed || weightsComputed : chainsComputed;
  if (!computed && !flagged) problems.push(`convergence figures of ${d.method} not computed and not flagged`);
  if (d.converged && !computed) problems.push("converged with a figure not computed");
  if (d.converged && d.method === "importance" && !((d.paretoK ?? Infinity) <= (d.paretoKThreshold ?? -Infinity))) {
    problems.push(`importance sampling converged with k-hat ${d.paretoK} above its threshold ${d.paretoKThreshold}`);
  }
  return problems;
}

/** The outcome counts of a property run and the failures, one line each. */
export interface CaseTally {
  readonly counts: Record<CaseOutcome["kind"], number>;
  readonly failures: string[];
}

/**
 * Runs `numRuns` generated cases (N up to `maximumPoints`) with a fixed fast-check seed, counting the
 * outcomes; every case runs (a failure is recorded, not raised), so the tally is complete.
 */
export function tallyFitCases(maximumPoints: number, maxEvaluations: number, seed: number, numRuns: number): CaseTally {
  const counts: Record<CaseOutcome["kind"], number> = { result: 0, "one-line error": 0, failure: 0 };
  const failures: string[] = [];
  fc.assert(
    fc.property(fitCases(maximumPoints), (c) => {
      const outcome = runCase(c, maxEvaluations);
      counts[outcome.kind]++;
      if (outcome.kind === "failure") failures.push(`${JSON.stringify(c)}: ${outcome.message}`);
    }),
    { seed, numRuns },
  );
  return { counts, failures };
}
