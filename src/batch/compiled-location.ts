import { existsSync } from "node:fs";
import { dirname, join, relative } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/**
 * Where a compiled file of the project is, given its path under `src/` (for example
 * `batch/fit-worker.js`). Worker threads and Slurm jobs run JavaScript, so these files always come from
 * the build: relative to this module when it is itself compiled (`dist/src/batch/`), and from the
 * project's `dist/src/` when this module runs from TypeScript source (under vitest or tsx). In the
 * second case the files are as fresh as the last `npm run build`; the batch tests check that.
 *
 * @throws Error naming the missing file and the command that makes it
 * @example compiledProjectFile("batch/fit-worker.js")
 */
export function compiledProjectFile(pathUnderSrc: string, moduleUrl: string = import.meta.url): URL {
  const here = fileURLToPath(moduleUrl);
  const srcRoot = join(dirname(here), "..");
  let candidate = join(srcRoot, pathUnderSrc);
  if (here.endsWith(".ts")) {
    const projectRoot = join(srcRoot, "..");
    candidate = join(projectRoot, "dist", "src", pathUnderSrc);
  }
  if (!existsSync(candidate)) {
    const shown = relative(process.cwd(), candidate) || candidate;
    throw new Error(`${shown} is missing: the batch workers run compiled code; run "npm run build" first`);
  }
  return pathToFileURL(candidate);
}

/** The compiled batch worker (`dist/src/batch/fit-worker.js`); see {@link compiledProjectFile}. */
export function compiledWorkerUrl(): URL {
  return compiledProjectFile("batch/fit-worker.js");
}

/** The compiled command line (`dist/src/cli/bin.js`), for job scripts; see {@link compiledProjectFile}. */
export function compiledCliPath(): string {
  return fileURLToPath(compiledProjectFile("cli/bin.js"));
}
