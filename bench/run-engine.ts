/**
 * The engine benchmark (prints Markdown; not a test). Sections:
 *   likelihood  cost per point of one log-likelihood (build from parameters + evaluate) for R = 1, 2, 4, 8
 *               at N = 1e3 ... 1e6, side by side with the C reference bench/c/engine-loglike.c
 *               (gcc -O3 -march=native, built here), interleaved batch by batch
 *   dense       against the O(N^3) dense engine at N = 500, 1000, 2000
 *   gradient    the log-likelihood gradient in log-likelihoods for R = 1, 2, 4 (and 8 up to N = 1e5) at
 *               N = 1e3 ... 1e6, and against the C reference's gradient (the same reverse pass), interleaved
 *   adapters    the gradient's cost through the model adapters NUTS and L-BFGS use (src/models)
 *   predict     predict cost per point at N = 1e4 and 1e5 with as many requested times
 *
 * Usage: node dist/bench/run-engine.js [--quick] [--rounds K] [--batch SECONDS] [--clock cpu|wall]
 *        [--sections a,b,...]   (or npx tsx bench/run-engine.ts ...)
 *
 * Figures are read from the process CPU-time clock by default: on a shared machine the wall clock mostly
 * measures how long the process waited for a core. Every C / TS ratio is also given on the other clock.
 */
import { readFileSync } from "node:fs";
import { availableParallelism, cpus, loadavg } from "node:os";
import { join } from "node:path";
import { createRng } from "../src/random/rng.js";
import { benchmarkData, engineCases, leadingPoints, type EngineCase } from "./engine-cases.js";
import { measureAdapters } from "./engine-adapters.js";
import { measureDense, measurePredict } from "./engine-companions.js";
import { fullGradient, measureGradient, type GradientRow } from "./engine-gradient.js";
import { fullLogLikelihood, measureLikelihood, type LikelihoodRow, type TimingSettings } from "./engine-likelihood.js";
import { buildNativeEngine, compilerVersion, NATIVE_FLAGS, repositoryRoot } from "./engine-native.js";
import { formatSignificant as fmt, markdownTable, type Clock } from "./engine-timing.js";

/** The TS engine must be within this factor of C for R = 1, 2, 4 at N = 1e5 and 1e6 (issue 2). */
const RATIO_TARGET = 1.5;
/** A gradient must cost at most this many log-likelihoods (issue 13). */
const GRADIENT_COST_TARGET = 3;
const SECTIONS = ["likelihood", "dense", "gradient", "adapters", "predict"] as const;
type Section = (typeof SECTIONS)[number];

interface Options {
  readonly quick: boolean;
  readonly settings: TimingSettings;
  readonly sections: ReadonlySet<Section>;
}

function parseOptions(argv: readonly string[]): Options {
  let quick = false;
  let rounds: number | undefined;
  let batchSeconds: number | undefined;
  let clock: Clock = "cpu";
  let sections: Section[] = [...SECTIONS];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--quick") quick = true;
    else if (arg === "--rounds") rounds = Number(argv[++i]);
    else if (arg === "--batch") batchSeconds = Number(argv[++i]);
    else if (arg === "--clock") {
      const value = argv[++i];
      if (value !== "cpu" && value !== "wall") throw new Error("--clock must be cpu or wall");
      clock = value;
    }
    else if (arg === "--sections") {
      sections = (argv[++i] ?? "").split(",").filter(Boolean) as Section[];
      const unknown = sections.filter((s) => !SECTIONS.includes(s));
      if (unknown.length) throw new Error(`unknown section(s) ${unknown.join(", ")}; known: ${SECTIONS.join(", ")}`);
    } else if (arg === "--help" || arg === "-h") {
      console.log(
        "usage: run-engine [--quick] [--rounds K] [--batch SECONDS] [--clock cpu|wall] [--sections likelihood,dense,gradient,adapters,predict]",
      );
      process.exit(0);
    } else throw new Error(`unknown option ${arg}`);
  }
  rounds ??= quick ? 5 : 9;
  batchSeconds ??= quick ? 0.03 : 0.06;
  if (!(rounds >= 1) || !(batchSeconds > 0)) throw new Error("--rounds must be >= 1 and --batch > 0");
  return { quick, settings: { rounds, batchSeconds, clock }, sections: new Set(sections) };
}

function cpuModel(): string {
  try {
    const line = readFileSync("/proc/cpuinfo", "utf8")
      .split("\n")
      .find((l) => l.startsWith("model name"));
    if (line) return line.split(":")[1].trim();
  } catch {
    // not Linux: fall through
  }
  return cpus()[0]?.model ?? "unknown";
}

function header(settings: TimingSettings): string {
  return [
    `# Horologium engine benchmark`,
    ``,
    `- date: ${new Date().toISOString()}`,
    `- machine: ${availableParallelism()} cores (nproc), ${cpuModel()}`,
    `- node ${process.version}; ${compilerVersion()} with ${NATIVE_FLAGS.join(" ")}`,
    `- load average at start: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`,
    `- ${settings.rounds} interleaved rounds per figure, batches of about ${settings.batchSeconds} s; medians over rounds`,
    `- clock: ${settings.clock === "cpu" ? "process CPU time (user + system)" : "wall clock"}`,
  ].join("\n");
}

/**
 * Runs every kernel many times on short light curves, then a few times on a longer one, so that V8 has
 * seen every kernel and optimised the engine as a whole function before timing. (Warming up on long
 * light curves alone leaves the engine in on-stack-replacement code that deoptimises on every call; see
 * bench/README.md.)
 */
function warmUp(cases: readonly EngineCase[]): void {
  for (const engineCase of cases) {
    const data = benchmarkData(engineCase.kernel, 10_000, createRng(`engine-warm-up:${engineCase.components}`));
    const short = fullLogLikelihood(engineCase, leadingPoints(data, 50));
    for (let i = 0; i < 2000; i++) short();
    const shortGradient = fullGradient(engineCase, leadingPoints(data, 50));
    for (let i = 0; i < 500; i++) shortGradient();
  }
  for (const engineCase of cases) {
    const data = benchmarkData(engineCase.kernel, 10_000, createRng(`engine-warm-up:${engineCase.components}`));
    const evaluate = fullLogLikelihood(engineCase, data);
    for (let i = 0; i < 20; i++) evaluate();
    const gradient = fullGradient(engineCase, data);
    for (let i = 0; i < 10; i++) gradient();
  }
}

async function likelihoodSection(cases: readonly EngineCase[], options: Options, executable: string, root: string): Promise<void> {
  const sizes = options.quick ? [1e3, 1e4, 1e5] : [1e3, 1e4, 1e5, 1e6];
  const rows: LikelihoodRow[] = [];
  for (const engineCase of cases) {
    for (const n of sizes) {
      const data = benchmarkData(engineCase.kernel, n, createRng(`engine:${engineCase.components}:${n}`));
      const file = join(root, "bench", "build", `engine-data-r${engineCase.components}-n${n}.bin`);
      const row = await measureLikelihood(engineCase, data, executable, file, options.settings);
      rows.push(row);
      process.stderr.write(
        `  R=${row.components} N=${n}: TS ${fmt(row.tsFull)} ns/pt, C ${fmt(row.nativeFull)} ns/pt, ratio ${fmt(row.ratioFull)}\n`,
      );
    }
  }

  console.log(`\n## Log-likelihood cost per point (build from parameters + evaluate), ns per point\n`);
  console.log(
    markdownTable(
      ["R", "kernel", ...sizes.map((n) => `N = ${n.toExponential(0)}`), "max / min over N"],
      cases.map((engineCase) => {
        const own = rows.filter((r) => r.components === engineCase.components).map((r) => r.tsFull);
        return [
          String(engineCase.components),
          engineCase.label,
          ...own.map((v) => fmt(v)),
          fmt(Math.max(...own) / Math.min(...own)),
        ];
      }),
    ),
  );

  console.log(`\n## TypeScript engine vs the C reference (same recursion, same data), ns per point\n`);
  console.log(
    "full = build from parameters + check inputs + evaluate; core = the recursion alone on prepared inputs; " +
      "ratios are TS / C, the median of ratios measured in the same round.\n",
  );
  console.log(
    markdownTable(
      [
        "R",
        "N",
        "TS full",
        "C full",
        "TS / C full",
        "TS / C full (other clock)",
        "TS core",
        "C core",
        "TS / C core",
        "log L (TS)",
        "log L (C)",
        "rel. diff",
      ],
      rows.map((r) => [
        String(r.components),
        r.n.toExponential(0),
        fmt(r.tsFull),
        fmt(r.nativeFull),
        fmt(r.ratioFull),
        fmt(r.ratioFullOtherClock),
        fmt(r.tsCore),
        fmt(r.nativeCore),
        fmt(r.ratioCore),
        r.tsValue.toPrecision(15),
        r.nativeValue.toPrecision(15),
        (Math.abs(r.tsValue - r.nativeValue) / Math.abs(r.nativeValue)).toExponential(1),
      ]),
    ),
  );

  const targeted = rows.filter((r) => r.components <= 4 && r.n >= 1e5);
  const worst = Math.max(...targeted.map((r) => r.ratioFull));
  const disagreement = Math.max(...rows.map((r) => Math.abs(r.tsValue - r.nativeValue) / Math.abs(r.nativeValue)));
  console.log(
    `\nTarget TS / C <= ${RATIO_TARGET} for R = 1, 2, 4 at N >= 1e5 (full): worst ${fmt(worst)} -> ` +
      `${worst <= RATIO_TARGET ? "met" : "NOT met"}. Largest TS / C log-likelihood relative difference: ${disagreement.toExponential(1)}.`,
  );
}

function denseSection(cases: readonly EngineCase[], options: Options): void {
  const sizes = options.quick ? [500, 1000] : [500, 1000, 2000];
  const denseSettings: TimingSettings = { ...options.settings, rounds: Math.min(options.settings.rounds, 3) };
  const rows = [];
  for (const engineCase of cases.filter((c) => c.components <= 4)) {
    const all = benchmarkData(engineCase.kernel, Math.max(...sizes), createRng(`engine-dense:${engineCase.components}`));
    for (const n of sizes) {
      const row = measureDense(engineCase, leadingPoints(all, n), denseSettings);
      rows.push(row);
      process.stderr.write(`  dense R=${row.components} N=${n}: ${fmt(row.denseMs)} ms vs ${fmt(row.semiseparableMs)} ms\n`);
    }
  }
  console.log(`\n## Against the dense O(N^3) engine (build from parameters + evaluate), ms per log-likelihood\n`);
  console.log(`${denseSettings.rounds} rounds; the speed-up is the median of per-round ratios.\n`);
  console.log(
    markdownTable(
      ["R", "N", "semiseparable (ms)", "dense (ms)", "speed-up", "log L rel. diff"],
      rows.map((r) => [
        String(r.components),
        String(r.n),
        fmt(r.semiseparableMs),
        fmt(r.denseMs),
        fmt(r.speedUp),
        r.relativeDifference.toExponential(1),
      ]),
    ),
  );
}

async function gradientSection(cases: readonly EngineCase[], options: Options, executable: string, root: string): Promise<void> {
  const sizes = options.quick ? [1e3, 1e4, 1e5] : [1e3, 1e4, 1e5, 1e6];
  const rows: GradientRow[] = [];
  for (const engineCase of cases) {
    for (const n of sizes) {
      if (engineCase.components > 4 && (options.quick || n > 1e5)) continue; // the tape of R = 8 at 1e6: 750 MB per engine
      const data = benchmarkData(engineCase.kernel, n, createRng(`engine-gradient:${engineCase.components}:${n}`));
      const file = join(root, "bench", "build", `engine-gradient-r${engineCase.components}-n${n}.bin`);
      const row = await measureGradient(engineCase, data, executable, file, options.settings);
      rows.push(row);
      process.stderr.write(
        `  gradient R=${row.components} N=${n}: ${fmt(row.costStep)} likelihoods (step), ${fmt(row.costNewProcess)} (new process), ${fmt(row.costCore)} (core); TS/C ${fmt(row.ratioGradient)}\n`,
      );
    }
  }
  console.log(`\n## Gradient cost, in log-likelihoods and against the C reference, ns per point\n`);
  console.log(
    "step = what a sampler pays: kernel from parameters, `withKernel` on checked inputs, logLikelihoodGradient against " +
      "logLikelihood; new process = the same with a new GaussianProcess per call (inputs copied, a fresh tape); core = the " +
      "gradient on prepared inputs (tape reused) against the recursion alone, and C the same forward pass with a tape and " +
      "reverse pass in C (gcc -O3); ratios are medians of ratios measured in the same round.\n",
  );
  console.log(
    markdownTable(
      ["R", "N", "TS log L step", "TS gradient step", "cost step", "cost new process", "TS gradient core", "cost core", "C gradient core", "C cost", "TS / C gradient", "TS / C log L core", "gradient TS vs C"],
      rows.map((r) => [
        String(r.components),
        r.n.toExponential(0),
        fmt(r.tsLikelihoodStep),
        fmt(r.tsGradientStep),
        fmt(r.costStep),
        fmt(r.costNewProcess),
        fmt(r.tsGradientCore),
        fmt(r.costCore),
        fmt(r.nativeGradientCore),
        fmt(r.nativeCost),
        fmt(r.ratioGradient),
        fmt(r.ratioLikelihood),
        r.gradientDifference.toExponential(1),
      ]),
    ),
  );
  const targeted = rows.filter((r) => r.components <= 4);
  const worst = Math.max(...targeted.map((r) => r.costStep));
  console.log(
    `\nTarget: a gradient at most ${GRADIENT_COST_TARGET} likelihoods for R = 1, 2, 4 (a sampler's step): worst ${fmt(worst)} -> ` +
      `${worst <= GRADIENT_COST_TARGET ? "met" : "NOT met"}. Largest TS / C gradient difference: ` +
      `${Math.max(...rows.map((r) => r.gradientDifference)).toExponential(1)} of the gradient's scale.`,
  );
}

function adaptersSection(options: Options): void {
  const rows = measureAdapters(options.settings);
  console.log(`\n## Gradient cost through the model adapters (modelLikelihood at the model's first guess)\n`);
  console.log(
    markdownTable(
      ["light curve", "model", "N", "value (ms)", "value + gradient (ms)", "cost in values"],
      rows.map((r) => [r.label, r.model, String(r.n), fmt(r.valueMs), fmt(r.gradientMs), fmt(r.cost)]),
    ),
  );
}

function predictSection(cases: readonly EngineCase[], options: Options): void {
  const sizes = options.quick ? [1e4] : [1e4, 1e5];
  const rows = [];
  for (const engineCase of cases) {
    for (const n of sizes) {
      const data = benchmarkData(engineCase.kernel, n, createRng(`engine-predict:${engineCase.components}:${n}`));
      rows.push(measurePredict(engineCase, data, n, options.settings));
    }
  }
  console.log(`\n## Prediction cost (build + predict mean and variance at M = N grid times)\n`);
  console.log(
    markdownTable(
      ["R", "N", "M", "log-likelihood (ns per data point)", "predict (ns per point of N + M)", "predict / log-likelihood"],
      rows.map((r) => [String(r.components), r.n.toExponential(0), r.m.toExponential(0), fmt(r.logLikelihood), fmt(r.predict), fmt(r.ratio)]),
    ),
  );
}

async function main(): Promise<void> {
  const options = parseOptions(process.argv.slice(2));
  const root = repositoryRoot();
  const executable = buildNativeEngine(root);
  const cases = engineCases();
  console.log(header(options.settings));
  process.stderr.write("warming up...\n");
  warmUp(cases);
  if (options.sections.has("likelihood")) await likelihoodSection(cases, options, executable, root);
  if (options.sections.has("dense")) denseSection(cases, options);
  if (options.sections.has("gradient")) await gradientSection(cases, options, executable, root);
  if (options.sections.has("adapters")) adaptersSection(options);
  if (options.sections.has("predict")) predictSection(cases, options);
  console.log(`\n- load average at end: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
