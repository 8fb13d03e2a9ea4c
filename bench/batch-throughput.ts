/**
 * Benchmark of `horologium batch`: fits per second on 1 and on 2 cores for a catalogue of simulated
 * quasar light curves (about 210 epochs over ten seasons, observed-frame timescales from 100 d to the baseline,
 * damped random walks of the invented Lanternfield survey: bench/batch-simulated-catalogue.ts),
 * fitted with the DRW model to the inference layer's convergence criteria; the scaling efficiency
 * (rate on 2 workers / twice the rate on 1); and the peak memory (resident set, main thread and workers)
 * of each run. Then, with the fast stand-in fit of the tests, the peak memory for a catalogue ten
 * times larger, to show that memory does not grow with the catalogue.
 *
 * Each configuration runs in a fresh child process, so that its peak memory is its own.
 *
 *   npm run build && node dist/bench/batch-throughput.js [--objects 1000] [--workers 1,2]
 *                    [--max-evaluations N] [--method auto|mcmc] [--fit-module FILE] [--skip-flatness]
 *
 * Besides fits per second (wall clock) it prints fits per CPU second of the whole process tree's
 * threads, the figure to read on a shared machine, and per method (importance sampling, or the MCMC
 * sampler a fit fell back to) the seconds per fit, evaluations per fit and per effective sample.
 *
 * --max-evaluations caps each fit's sampling budget (fits that run out are counted as not converged):
 * a way to measure the batch machinery's scaling in minutes when converged fits take minutes each.
 *
 * Prints figures; it is not a test. On a shared machine the rates vary with the other load.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { parseArgs } from "node:util";
import { runBatch } from "../src/batch/batch-run.js";
import { openCatalogue } from "../src/batch/catalogue-input.js";
import { readResultsTable } from "../src/batch/results-table-reader.js";
import { writeQuasarCatalogue } from "./batch-simulated-catalogue.js";

/** What one configuration measured. */
interface Measurement {
  readonly workers: number;
  readonly objects: number;
  readonly seconds: number;
  readonly ok: number;
  readonly failed: number;
  readonly converged: number;
  readonly medianPoints: number;
  readonly peakRssMb: number;
  /** Process CPU seconds (main thread and workers) of the run. */
  readonly cpuSeconds: number;
  /** Per method ("importance", "ensemble", ...): the fits' figures from the results table. */
  readonly methods: Readonly<Record<string, MethodFigures>>;
}

/** Figures of the fits one method computed. */
interface MethodFigures {
  readonly fits: number;
  readonly converged: number;
  readonly secondsMedian: number;
  readonly secondsP90: number;
  readonly secondsMax: number;
  readonly evaluationsMedian: number;
  readonly evaluationsPerEssMedian: number;
}

function quantileOf(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))] : NaN;
}

const SELF = fileURLToPath(import.meta.url);
const STAND_IN_FIT = fileURLToPath(new URL("../../test/batch/fixtures/summary-fit.mjs", import.meta.url));

/** Child mode: one batch run, then its measurement as JSON on stdout. */
async function measure(
  catalogue: string,
  out: string,
  workers: number,
  fitModule: string | undefined,
  maxEvaluations: number | undefined,
  method: string | undefined,
): Promise<Measurement> {
  const input = await openCatalogue(catalogue, { idColumn: "object_id" });
  const started = performance.now();
  const cpuStart = process.cpuUsage();
  const summary = await runBatch({
    objects: input.objects(),
    inputDescription: catalogue,
    out,
    format: "csv",
    model: "drw",
    seed: 1,
    fitOptions: { ...(maxEvaluations === undefined ? {} : { maxEvaluations }), ...(method === undefined ? {} : { method }) },
    shard: { index: 0, count: 1 },
    workers,
    fitModule: fitModule === undefined ? undefined : pathToFileURL(fitModule).href,
    mode: "overwrite",
    now: () => Date.now(),
  });
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpuStart);
  let converged = 0;
  const points: number[] = [];
  const byMethod = new Map<string, { converged: number; seconds: number[]; evaluations: number[]; perEss: number[] }>();
  for await (const row of readResultsTable(out)) {
    if (row["diagnostics.converged"] === true) converged += 1;
    if (typeof row["data.n"] === "number") points.push(row["data.n"]);
    const method = String(row["diagnostics.method"] ?? row["diagnostics.sampler"] ?? "unknown");
    const entry = byMethod.get(method) ?? { converged: 0, seconds: [], evaluations: [], perEss: [] };
    byMethod.set(method, entry);
    if (row["diagnostics.converged"] === true) entry.converged += 1;
    const fitSeconds = Number(row["diagnostics.seconds"]);
    const evaluations = Number(row["diagnostics.likelihoodEvaluations"]);
    const ess = Number(row["diagnostics.essMin"]);
    entry.seconds.push(fitSeconds);
    entry.evaluations.push(evaluations);
    entry.perEss.push(evaluations / ess);
  }
  const methods: Record<string, MethodFigures> = {};
  for (const [name, e] of byMethod) {
    methods[name] = {
      fits: e.seconds.length,
      converged: e.converged,
      secondsMedian: quantileOf(e.seconds, 0.5),
      secondsP90: quantileOf(e.seconds, 0.9),
      secondsMax: quantileOf(e.seconds, 1),
      evaluationsMedian: quantileOf(e.evaluations, 0.5),
      evaluationsPerEssMedian: quantileOf(e.perEss, 0.5),
    };
  }
  points.sort((a, b) => a - b);
  return {
    workers,
    objects: summary.recorded,
    seconds,
    ok: summary.ok,
    failed: summary.failed,
    converged,
    medianPoints: points.length ? points[Math.floor(points.length / 2)] : NaN,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    methods,
  };
}

function runChild(
  catalogue: string,
  out: string,
  workers: number,
  fitModule: string | undefined,
  maxEvaluations?: number,
  method?: string,
): Measurement {
  const args = [SELF, "--child", "--catalogue", catalogue, "--out", out, "--workers", String(workers)];
  if (method) args.push("--method", method);
  if (fitModule) args.push("--fit-module", fitModule);
  if (maxEvaluations !== undefined) args.push("--max-evaluations", String(maxEvaluations));
  const result = spawnSync(process.execPath, args, { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"], maxBuffer: 1 << 20 });
  if (result.status !== 0) throw new Error(`the ${workers}-worker run failed (exit ${result.status})`);
  return JSON.parse(result.stdout.trim().split("\n").at(-1)!) as Measurement;
}

function describe(m: Measurement): string {
  const rate = m.objects / m.seconds;
  return (
    `  ${String(m.workers).padStart(7)}  ${String(m.objects).padStart(7)}  ${m.seconds.toFixed(1).padStart(8)}` +
    `  ${rate.toPrecision(3).padStart(8)}  ${`${m.converged}/${m.ok}`.padStart(9)}  ${String(m.failed).padStart(6)}` +
    `  ${m.peakRssMb.toFixed(0).padStart(8)}  ${(m.objects / m.cpuSeconds).toPrecision(3).padStart(13)}  ${(m.objects / m.seconds / m.workers).toPrecision(3).padStart(11)}`
  );
}

const HEADER = "  workers  objects  seconds  fits/s  converged  failed  peak MB  fits/CPU-s  fits/s/core";

function describeMethods(m: Measurement): string[] {
  return Object.entries(m.methods).map(
    ([name, f]) =>
      `    ${m.workers} worker(s), ${name}: ${f.fits} fits, ${f.converged} converged; seconds per fit median ${f.secondsMedian.toPrecision(3)}, ` +
      `p90 ${f.secondsP90.toPrecision(3)}, max ${f.secondsMax.toPrecision(3)}; likelihood evaluations median ${f.evaluationsMedian.toFixed(0)}, ` +
      `per effective sample ${f.evaluationsPerEssMedian.toPrecision(3)}`,
  );
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      child: { type: "boolean" },
      catalogue: { type: "string" },
      out: { type: "string" },
      objects: { type: "string", default: "1000" },
      workers: { type: "string", default: "1,2" },
      "fit-module": { type: "string" },
      "max-evaluations": { type: "string" },
      method: { type: "string" },
      "skip-flatness": { type: "boolean" },
    },
  });
  const maxEvaluations = values["max-evaluations"] === undefined ? undefined : Number(values["max-evaluations"]);
  if (values.child) {
    const m = await measure(values.catalogue!, values.out!, Number(values.workers), values["fit-module"], maxEvaluations, values.method);
    process.stdout.write(JSON.stringify(m) + "\n");
    return;
  }
  const objects = Number(values.objects);
  const workerCounts = values.workers!.split(",").map(Number);
  const folder = mkdtempSync(join(tmpdir(), "horologium-bench-batch-"));
  try {
    const catalogue = join(folder, "lanternfield-quasars.csv");
    const rows = await writeQuasarCatalogue(catalogue, { objects, seed: 1000 });
    const budget = maxEvaluations === undefined ? "default budget, to convergence" : `budget ${maxEvaluations} evaluations`;
    const fit = values["fit-module"] ? `fit module ${values["fit-module"]}` : `Horologium's DRW fit (${budget}, method ${values.method ?? "auto"})`;
    console.log(`load average at start: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    console.log(`batch throughput: ${objects} simulated quasars (${(rows / objects).toFixed(0)} points on average), ${fit}`);
    console.log(HEADER);
    const measured: Measurement[] = [];
    for (const workers of workerCounts) {
      const m = runChild(catalogue, join(folder, `results-${workers}.csv`), workers, values["fit-module"], maxEvaluations, values.method);
      measured.push(m);
      console.log(describe(m));
    }
    for (const m of measured) for (const line of describeMethods(m)) console.log(line);
    console.log(`load average at end: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    const one = measured.find((m) => m.workers === 1);
    for (const m of measured) {
      if (!one || m.workers === 1) continue;
      const efficiency = m.objects / m.seconds / ((one.objects / one.seconds) * m.workers);
      console.log(`scaling efficiency on ${m.workers} workers: ${(100 * efficiency).toFixed(0)}% (rate / (${m.workers} x rate on 1))`);
    }

    if (!values["skip-flatness"]) {
      console.log("\nmemory against catalogue size (stand-in fit of the tests, 2 workers):");
      console.log(HEADER);
      for (const size of [1000, 10000]) {
        const small = join(folder, `flat-${size}.csv`);
        await writeQuasarCatalogue(small, { objects: size, seed: 7, seasons: 1 });
        console.log(describe(runChild(small, join(folder, `flat-results-${size}.csv`), 2, STAND_IN_FIT)));
      }
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

await main();
