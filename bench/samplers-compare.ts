/**
 * Which sampler needs fewer log-likelihood evaluations per effective sample? Runs NUTS and the walker
 * ensemble side by side, from the same MAP start, until both meet the convergence criteria (R-hat
 * < 1.01, bulk and tail ESS >= 400, chains >= 50 autocorrelation times), on a damped random walk of 250
 * points and a quasi-periodic light curve of 1000 points. A gradient counts as DEFAULT_GRADIENT_COST
 * evaluations (bench/samplers-gradient-cost.ts). Prints, per model and sampler: whether it converged,
 * evaluations (optimiser included), the smallest bulk/tail ESS, evaluations per effective sample and
 * seconds per converged fit.
 *
 * Run: npx tsx bench/samplers-compare.ts [seeds=1] [drw|qp|all]
 */
import { DEFAULT_GRADIENT_COST } from "../src/inference/gradient-cost.js";
import { samplePosterior, type SamplerKind } from "../src/inference/sample-posterior.js";
import { dampedRandomWalkFit, quasiPeriodicFit, type SimulatedFit } from "./samplers-gp-models.js";

const seeds = Number(process.argv[2] ?? 1);
const which = process.argv[3] ?? "all";
const fits: SimulatedFit[] = [];
if (which === "all" || which === "drw") fits.push(dampedRandomWalkFit(250));
if (which === "all" || which === "qp") fits.push(quasiPeriodicFit(1000));
const samplers: SamplerKind[] = ["nuts", "ensemble"];

console.log(`gradient cost: ${DEFAULT_GRADIENT_COST} log-likelihood evaluations; seeds: ${seeds}`);
console.log(
  "model                       sampler   seed  stop       evaluations   ESS min   evals/ESS   seconds   R-hat max  autocorr",
);
const totals = new Map<string, { evaluations: number; ess: number; seconds: number; converged: number }>();
for (const fit of fits) {
  for (let s = 0; s < seeds; s++) {
    for (const sampler of samplers) {
      const seed = 1000 + s;
      let shown = 0;
      const result = samplePosterior(fit.space, fit.likelihood, {
        seed,
        sampler,
        initial: fit.initial,
        maxEvaluations: 5e6,
        // Progress on stderr, every tenth of the run, so a long benchmark shows it is alive.
        onProgress: (p) => {
          const tenth = Math.floor(p.fraction * 10);
          if (tenth > shown) {
            shown = tenth;
            console.error(`  ${fit.label}, ${sampler}: ${p.phase} ${(100 * p.fraction).toFixed(0)}%, ${p.likelihoodEvaluations.toFixed(0)} evaluations`);
          }
        },
      });
      const d = result.diagnostics;
      const key = `${fit.label}|${sampler}`;
      const t = totals.get(key) ?? { evaluations: 0, ess: 0, seconds: 0, converged: 0 };
      totals.set(key, {
        evaluations: t.evaluations + d.likelihoodEvaluations,
        ess: t.ess + d.essMin,
        seconds: t.seconds + d.seconds,
        converged: t.converged + (d.converged ? 1 : 0),
      });
      console.log(
        [
          fit.label.padEnd(27),
          sampler.padEnd(9),
          String(seed).padStart(4),
          result.stopReason.padEnd(10),
          d.likelihoodEvaluations.toFixed(0).padStart(12),
          d.essMin.toFixed(0).padStart(9),
          (d.likelihoodEvaluations / d.essMin).toFixed(1).padStart(11),
          d.seconds.toFixed(1).padStart(9),
          d.rhatMax.toFixed(4).padStart(11),
          d.autocorrelationTime.toFixed(1).padStart(9),
        ].join(" "),
      );
      const summary = Object.entries(result.parameters)
        .map(([name, p]) => `${name} ${p.median.toPrecision(4)} [${p.q16.toPrecision(4)}, ${p.q84.toPrecision(4)}]`)
        .join("; ");
      console.log(`    ${summary}`);
    }
  }
}
console.log("\nper model and sampler (sums over seeds):");
console.log("model                       sampler   converged  evals/ESS  evaluations/fit  seconds/fit");
for (const [key, t] of totals) {
  const [model, sampler] = key.split("|");
  console.log(
    [
      model!.padEnd(27),
      sampler!.padEnd(9),
      `${t.converged}/${seeds}`.padStart(9),
      (t.evaluations / t.ess).toFixed(1).padStart(10),
      (t.evaluations / seeds).toFixed(0).padStart(16),
      (t.seconds / seeds).toFixed(1).padStart(12),
    ].join(" "),
  );
}
