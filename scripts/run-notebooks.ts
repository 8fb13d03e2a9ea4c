/**
 * Runs the literate TypeScript notebooks of notebooks-ts/ and writes one HTML page per notebook, with
 * its figures (SVG inline, plus SVG and PNG files beside the page), under out/notebooks/.
 *
 * Usage: tsx scripts/run-notebooks.ts [NAME ...] [--jobs N] [--out DIR]
 *   NAME     run only these notebooks (file names without .ts); default all of notebooks-ts/*.ts
 *   --jobs   notebooks run at once, each in its own process (default: 2, or 1 on a single core)
 *   --out    output folder (default out/notebooks)
 *
 * Each notebook runs in a fresh Node process (with the tsx loader) from an instrumented copy written to
 * OUT/.build/NAME.mts (removed afterwards), its relative imports rewritten to absolute file URLs; error
 * output names the notebook's own file. The exit status is non-zero when any notebook fails.
 */
import { spawn } from "node:child_process";
import { readdir, readFile, rm, writeFile, mkdir } from "node:fs/promises";
import { availableParallelism } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { instrumentNotebook, notebookCells } from "../notebooks-ts/kit/notebook-cells.js";
import { escapeHtml, renderInline } from "../notebooks-ts/kit/markdown.js";
import { notebookTitle } from "../notebooks-ts/kit/notebook-page.js";

const root = resolve(dirname(fileURLToPath(import.meta.url)), "..");
const notebookDir = join(root, "notebooks-ts");

interface Outcome {
  readonly name: string;
  readonly ok: boolean;
  readonly seconds: number;
  readonly figures: number;
  readonly title: string;
  readonly summary: string;
}

function parseArguments(argv: string[]): { names: string[]; jobs: number; out: string } {
  const names: string[] = [];
  let jobs = Math.min(2, availableParallelism());
  let out = join(root, "out", "notebooks");
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--jobs") {
      jobs = Number(argv[++i]);
      if (!(Number.isInteger(jobs) && jobs >= 1)) throw new Error(`--jobs needs a positive integer, got ${argv[i]}`);
    } else if (arg === "--out") {
      out = resolve(argv[++i] ?? "");
    } else if (arg === "--help" || arg === "-h") {
      process.stdout.write("Usage: tsx scripts/run-notebooks.ts [NAME ...] [--jobs N] [--out DIR]\n");
      process.exit(0);
    } else if (arg.startsWith("-")) {
      throw new Error(`unknown option ${arg}`);
    } else {
      names.push(arg.replace(/\.ts$/, "").replace(/^.*\//, ""));
    }
  }
  return { names, jobs, out };
}

async function listNotebooks(): Promise<string[]> {
  const entries = await readdir(notebookDir, { withFileTypes: true });
  return entries
    .filter((e) => e.isFile() && e.name.endsWith(".ts") && !e.name.startsWith("."))
    .map((e) => e.name.replace(/\.ts$/, ""))
    .sort();
}

/** The first paragraph after the title, for the index page. */
function summaryOf(source: string): string {
  const prose = notebookCells(source).find((c) => c.kind === "markdown");
  if (!prose || prose.kind !== "markdown") return "";
  const paragraph = prose.text.split(/\n\s*\n/).find((p) => p.trim() !== "" && !p.trim().startsWith("#"));
  return paragraph?.replace(/\s+/g, " ").trim() ?? "";
}

async function runOne(name: string, out: string): Promise<Outcome> {
  const sourcePath = join(notebookDir, `${name}.ts`);
  const source = await readFile(sourcePath, "utf8");
  const title = notebookTitle(notebookCells(source), name);
  const buildDir = join(out, ".build");
  await mkdir(buildDir, { recursive: true });
  // .mts: an ES module wherever --out points, even outside this package (whose package.json says "module").
  const runPath = join(buildDir, `${name}.mts`);
  const fromNotebook = (specifier: string) => pathToFileURL(resolve(notebookDir, specifier)).href;
  await writeFile(runPath, instrumentNotebook(source, fromNotebook("./kit/notebook-output.js"), sourcePath, out, fromNotebook), "utf8");
  const started = performance.now();
  process.stderr.write(`${name}: running\n`);
  try {
    const { code, stdout, stderr } = await new Promise<{ code: number | null; stdout: string; stderr: string }>((done) => {
      const child = spawn(process.execPath, ["--import", "tsx", runPath], { cwd: root, stdio: ["ignore", "pipe", "pipe"] });
      let stdout = "";
      let stderr = "";
      child.stdout.on("data", (chunk: Buffer) => (stdout += chunk.toString()));
      child.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
      child.on("close", (code) => done({ code, stdout, stderr }));
    });
    const seconds = (performance.now() - started) / 1000;
    const line = stdout.trim().split("\n").filter((l) => l.startsWith("{")).pop();
    const report = line ? (JSON.parse(line) as { figures: number; html: string }) : undefined;
    if (code !== 0 || !report) {
      const cleaned = stderr.replaceAll(runPath, sourcePath).split("\n").filter((l) => !/^\s*cell \d+$/.test(l)).join("\n");
      process.stderr.write(`${name}: FAILED (exit ${code}) after ${seconds.toFixed(0)} s; last cell: ${lastCell(stderr)}\n${cleaned}\n`);
      return { name, ok: false, seconds, figures: 0, title, summary: summaryOf(source) };
    }
    process.stderr.write(`${name}: ${seconds.toFixed(0)} s, ${report.figures} figures -> ${report.html}\n`);
    return { name, ok: true, seconds, figures: report.figures, title, summary: summaryOf(source) };
  } finally {
    await rm(runPath, { force: true });
  }
}

function lastCell(stderr: string): string {
  const cells = [...stderr.matchAll(/^\s*cell (\d+)$/gm)];
  return cells.length > 0 ? String(Number(cells[cells.length - 1][1]) + 1) : "none";
}

function indexPage(outcomes: readonly Outcome[]): string {
  const items = outcomes
    .map((o) =>
      o.ok
        ? `<li><a href="${escapeHtml(o.name)}.html">${renderInline(o.title)}</a> <span class="meta">(${o.seconds.toFixed(0)} s, ${o.figures} figures)</span><br>${renderInline(o.summary)}</li>`
        : `<li><strong>${renderInline(o.title)}</strong>: failed</li>`,
    )
    .join("\n");
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'">
<title>Horologium notebooks</title>
<style>body{font-family:"DejaVu Sans",Verdana,sans-serif;max-width:860px;margin:2rem auto;padding:0 1rem;line-height:1.5}li{margin:0.8rem 0}.meta{color:#777;font-size:0.85rem}code{background:#f4f4f4}</style>
</head><body><h1>Horologium notebooks</h1>
<p>Worked studies on invented light curves of the Lanternfield Deep Survey, executed by <code>npm run notebooks</code>.</p>
<ul>
${items}
</ul></body></html>
`;
}

async function main(): Promise<void> {
  const { names, jobs, out } = parseArguments(process.argv.slice(2));
  const available = await listNotebooks();
  for (const name of names) if (!available.includes(name)) throw new Error(`no notebook notebooks-ts/${name}.ts (have: ${available.join(", ")})`);
  const chosen = names.length > 0 ? names : available;
  await mkdir(out, { recursive: true });
  const started = performance.now();
  const outcomes: Outcome[] = new Array(chosen.length);
  let next = 0;
  const worker = async () => {
    while (next < chosen.length) {
      const k = next++;
      outcomes[k] = await runOne(chosen[k], out);
    }
  };
  await Promise.all(Array.from({ length: Math.min(jobs, chosen.length) }, worker));
  await writeFile(join(out, "index.html"), indexPage(outcomes), "utf8");
  const failed = outcomes.filter((o) => !o.ok);
  const total = (performance.now() - started) / 1000;
  process.stderr.write(`${outcomes.length - failed.length} of ${outcomes.length} notebooks ran in ${total.toFixed(0)} s -> ${join(out, "index.html")}\n`);
  if (failed.length > 0) process.exitCode = 1;
}

main().catch((error: unknown) => {
  process.stderr.write(`run-notebooks: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exitCode = 1;
});
