/**
 * Joint multi-band fits on simulated six-band quasars (issue 14): a shared damped random walk (tau 150 d,
 * sigma 0.2 mag in the reference band) seen in u, g, r, i, z, y with amplitudes falling with wavelength
 * (1.3 to 0.7) and per-band depths (Ivezic et al. 2019, eq. 5), 360 interleaved visits over three seasons.
 * For each light curve: wall and CPU seconds of the joint fit, the method that computed the posterior and
 * its likelihood evaluations, whether it converged, whether the true tau
 * lies in its 68% / 95% intervals, the width of its 68% interval against the best single band's, and the
 * recovered amplitude ratios. With --lags, band u leads g by 2 d and r, i, z, y follow it by 2, 4, 6, 8 d,
 * the fit samples the lags too (12 parameters), and the largest lag error in posterior sd is printed.
 * Prints Markdown; nothing is asserted.
 *
 *   npx tsx bench/multi-band-fit.ts [--curves K] [--single] [--lags]   (--single also fits every band on its own)
 */
import { kernels } from "../src/kernels/index.js";
import { seasonalGroundCadence } from "../src/lightcurve/cadence.js";
import { fitJointDetailed } from "../src/models/fit-joint.js";
import { fitLightCurve } from "../src/models/fit-light-curve.js";
import { simulateInterleavedBands } from "../src/models/simulated-bands.js";
import { createRng } from "../src/random/rng.js";
import { formatSignificant, markdownTable, median } from "./engine-timing.js";
import { numberArgument } from "./command-line.js";

const TAU = 150;
const NAMES = ["u", "g", "r", "i", "z", "y"];
const AMPLITUDES = [1.3, 1.18, 1.06, 0.94, 0.82, 0.7];
const DEPTHS = [23.5, 24.5, 24.3, 23.9, 23.3, 22.5];
const LAGS = [-2, 0, 2, 4, 6, 8];

function main(): void {
  const curves = numberArgument("curves", 5);
  const single = process.argv.includes("--single");
  const lags = process.argv.includes("--lags");
  const rows: string[][] = [];
  const seconds: number[] = [];
  const cpuSeconds: number[] = [];
  let converged = 0;
  let in68 = 0;
  let in95 = 0;
  for (let c = 0; c < curves; c++) {
    const rng = createRng(`bench:multi-band-fit:${c}`);
    const visits = seasonalGroundCadence({ seasons: 3, revisitInterval: 1, weatherLoss: 0.3 }, rng).slice(0, 360);
    const bands = NAMES.map((name, b) => ({ name, amplitude: AMPLITUDES[b] / AMPLITUDES[1], mean: 20 - 0.1 * b, depth5Sigma: DEPTHS[b], lag: lags ? LAGS[b] : 0 }));
    const lightCurves = simulateInterleavedBands(kernels.dampedRandomWalk({ sigma: 0.2, tau: TAU }), visits, bands, rng, `simulated-${c}`);
    const cpu0 = process.cpuUsage();
    const fit = fitJointDetailed(lightCurves, { model: "drw", seed: c + 1, referenceBand: "g", ...(lags ? { lags: true } : {}) });
    const cpu = process.cpuUsage(cpu0);
    const tau = fit.result.parameters.tau;
    seconds.push(fit.result.diagnostics.seconds);
    cpuSeconds.push((cpu.user + cpu.system) / 1e6);
    if (fit.result.diagnostics.converged) converged++;
    if (tau.q16 <= TAU && TAU <= tau.q84) in68++;
    if (tau["q2.5"] <= TAU && TAU <= tau["q97.5"]) in95++;
    let ratioError = 0;
    let lagError = 0;
    bands.forEach((band) => {
      ratioError = Math.max(ratioError, Math.abs(fit.result.parameters[`amplitude.${band.name}`].median / band.amplitude - 1));
      const lag = fit.result.parameters[`lag.${band.name}`];
      if (lags && lag && lag.sd > 0) lagError = Math.max(lagError, Math.abs(lag.median - band.lag) / lag.sd);
    });
    let bestSingle = NaN;
    if (single) {
      const widths = lightCurves.map((lc) => {
        const s = fitLightCurve(lc, { model: "drw", seed: c + 1 }).parameters.tau;
        return Math.log(s.q84 / s.q16);
      });
      bestSingle = Math.min(...widths);
    }
    rows.push([
      String(c),
      formatSignificant(fit.result.diagnostics.seconds),
      formatSignificant((cpu.user + cpu.system) / 1e6),
      fit.result.diagnostics.method ?? "-",
      String(fit.result.diagnostics.likelihoodEvaluations),
      String(fit.result.diagnostics.converged),
      `${formatSignificant(tau.q16)} - ${formatSignificant(tau.q84)}`,
      formatSignificant(Math.log(tau.q84 / tau.q16)),
      Number.isNaN(bestSingle) ? "-" : formatSignificant(bestSingle),
      formatSignificant(100 * ratioError, 2),
      ...(lags ? [formatSignificant(lagError, 2)] : []),
    ]);
  }
  console.log(
    markdownTable(
      ["curve", "joint fit s (wall)", "CPU s", "method", "evaluations", "converged", "tau 68% interval", "ln(q84/q16) joint", "best single band", "largest amplitude-ratio error %", ...(lags ? ["largest lag error / sd"] : [])],
      rows,
    ),
  );
  console.log(`\nmedian wall seconds ${formatSignificant(median(seconds))}, CPU seconds ${formatSignificant(median(cpuSeconds))}; converged ${converged}/${curves}; tau in 68%: ${in68}/${curves}, in 95%: ${in95}/${curves}`);
}

main();
