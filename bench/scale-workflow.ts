/**
 * Scale benchmark of the whole workflow (issue 12): for a light curve of N points, the seconds and the
 * peak resident memory of each stage: simulate, write and read the CSV, every stage of the fit
 * (data summary, periodogram, robust noise, modes, sampling, pooling, mean restoration, summaries,
 * result), the report (figures and HTML) and a prediction at 1000 times. Damped random walk (a quasar
 * seen continuously, 2-minute cadence, tau = 5 d) or quasi-periodic rotation (a spotted star, period
 * 3.7 d, decay time 20 d); invented data.
 *
 * Each (model, N) runs in a fresh child process so that its peak memory is its own:
 *
 *   npm run build && node dist/bench/scale-workflow.js [--model drw|quasi-periodic] [--sizes 1e3,1e4,1e5,1e6]
 *
 * Prints a Markdown table (bench/README.md records it). Peak memory is the process's maximum resident
 * set after the stage (process.resourceUsage().maxRSS), so it can only grow along a row. Not a test.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { GaussianProcess } from "../src/gp/gaussian-process.js";
import { kernels } from "../src/kernels/index.js";
import { readLightCurves } from "../src/lightcurve/read-light-curves.js";
import { fitLightCurveDetailed } from "../src/models/fit-light-curve.js";
import type { ModelName } from "../src/models/light-curve-model.js";
import { posteriorPredictive } from "../src/models/posterior-predictive.js";
import { storedPosteriorSample } from "../src/models/posterior-sample.js";
import { createRng } from "../src/random/rng.js";
import { reportInputFromFit } from "../src/report/report-from-fit.js";
import { writeReport } from "../src/report/write-report.js";

const CADENCE_DAYS = 2 / 1440;

/** One (model, N) in this process: prints one JSON line of stage seconds and peak memory. */
async function measureOne(model: ModelName, n: number, seed: number): Promise<void> {
  const stages: { stage: string; seconds: number; peakMb: number }[] = [];
  const wallStart = performance.now();
  let last = cpuMilliseconds();
  const lap = (stage: string, seconds?: number) => {
    const now = cpuMilliseconds();
    stages.push({ stage, seconds: seconds ?? (now - last) / 1000, peakMb: process.resourceUsage().maxRSS / 1024 });
    last = now;
  };
  const rng = createRng(`scale:${model}:${n}:${seed}`);
  const time = Float64Array.from({ length: n }, (_, i) => 60000 + i * CADENCE_DAYS);
  const kernel = model === "drw"
    ? kernels.dampedRandomWalk({ sigma: 0.1, tau: 5 })
    : kernels.quasiPeriodic({ sigma: 0.01, period: 3.7, decayTime: 20, harmonicWeight: 0.3 });
  const error = model === "drw" ? 0.01 : 0.002;
  const latent = new GaussianProcess(kernel, time, { mean: 15 }).priorDraw(rng);
  const dir = mkdtempSync(join(tmpdir(), "horologium-scale-"));
  const lines = ["time,mag,mag_err"];
  for (let i = 0; i < n; i++) lines.push(`${time[i].toFixed(6)},${(latent[i] + error * rng.normal()).toFixed(5)},${error}`);
  lap("simulate");
  writeFileSync(join(dir, "lc.csv"), lines.join("\n") + "\n");
  lines.length = 0;
  lap("write CSV");
  const lightCurve = (await readLightCurves(join(dir, "lc.csv"))).lightCurves[0];
  lap("read CSV");
  const fit = fitLightCurveDetailed(lightCurve, { model, seed, clock: cpuMilliseconds });
  last = cpuMilliseconds();
  for (const [stage, seconds] of Object.entries(fit.stageSeconds)) lap(`fit: ${stage}`, seconds);
  const input = reportInputFromFit(fit.conditioning, fit.result, fit.model);
  await writeReport(input, join(dir, "report"));
  lap("report");
  const sample = storedPosteriorSample(fit.result, fit.model.space.names);
  const times = Float64Array.from({ length: 1000 }, (_, k) => time[0] + ((time[n - 1] - time[0]) * k) / 999);
  posteriorPredictive(fit.model, fit.conditioning, sample.rows.slice(0, 100), times);
  lap("predict");
  rmSync(dir, { recursive: true, force: true });
  const d = fit.result.diagnostics;
  const wallSeconds = (performance.now() - wallStart) / 1000;
  console.log(JSON.stringify({ model, n, stages, wallSeconds, converged: d.converged, method: d.method, rhatMax: d.rhatMax, essMin: d.essMin, paretoK: d.paretoK ?? null, evaluations: d.likelihoodEvaluations }));
}

/** CPU time of this process (user + system), milliseconds: the figure that a shared machine's load does not inflate. */
function cpuMilliseconds(): number {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1000;
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { model: { type: "string" }, sizes: { type: "string" }, one: { type: "string" }, seed: { type: "string" } } });
  const model = (values.model ?? "drw") as ModelName;
  const seed = Number(values.seed ?? 1);
  if (values.one !== undefined) return measureOne(model, Number(values.one), seed);
  const sizes = (values.sizes ?? "1e3,1e4,1e5,1e6").split(",").map(Number);
  const rows: MeasuredRow[] = [];
  for (const n of sizes) {
    const child = spawnSync(process.execPath, ["--max-old-space-size=4096", fileURLToPath(import.meta.url), "--one", String(n), "--model", model, "--seed", String(seed)], {
      encoding: "utf8",
      maxBuffer: 1 << 24,
    });
    const line = child.stdout.trim().split("\n").pop() ?? "";
    if (child.status !== 0 || !line.startsWith("{")) {
      console.error(`N = ${n}: failed (${child.status}): ${child.stderr.trim().split("\n").slice(-3).join(" | ")}`);
      continue;
    }
    rows.push(JSON.parse(line));
    console.error(`N = ${n} done: ${line}`);
  }
  const stageNames = rows[0]?.stages.map((s) => s.stage) ?? [];
  console.log(`Model ${model}: CPU seconds (peak resident MB) per stage\n`);
  console.log(`| stage | ${rows.map((r) => `N = ${r.n.toExponential(0)}`).join(" | ")} |`);
  console.log(`| --- | ${rows.map(() => "---").join(" | ")} |`);
  for (const stage of stageNames) {
    const cells = rows.map((r) => {
      const s = r.stages.find((x) => x.stage === stage);
      return s ? `${s.seconds.toFixed(s.seconds < 10 ? 2 : 0)} (${Math.round(s.peakMb)})` : "-";
    });
    console.log(`| ${stage} | ${cells.join(" | ")} |`);
  }
  const total = rows.map((r) => r.stages.filter((s) => s.stage !== "simulate").reduce((sum, s) => sum + s.seconds, 0).toFixed(0));
  console.log(`| total CPU (without simulate) | ${total.join(" | ")} |`);
  console.log(`| wall seconds (with simulate) | ${rows.map((r) => r.wallSeconds.toFixed(0)).join(" | ")} |`);
  console.log(`| likelihood evaluations | ${rows.map((r) => String(Math.round(r.evaluations))).join(" | ")} |`);
  console.log(`| converged (method: R-hat or k-hat, ESS) | ${rows.map(convergenceCell).join(" | ")} |`);
}

/** What one child process measured. */
interface MeasuredRow {
  readonly n: number;
  readonly stages: readonly { stage: string; seconds: number; peakMb: number }[];
  readonly wallSeconds: number;
  readonly converged: boolean;
  readonly method: string;
  readonly rhatMax: number | null;
  readonly paretoK: number | null;
  readonly essMin: number;
  readonly evaluations: number;
}

function convergenceCell(row: MeasuredRow): string {
  const figure = row.rhatMax !== null ? `R-hat ${row.rhatMax.toFixed(3)}` : `k-hat ${(row.paretoK ?? NaN).toFixed(2)}`;
  return `${row.converged ? "yes" : "no"} (${row.method}: ${figure}, ESS ${Math.round(row.essMin)})`;
}

await main();
