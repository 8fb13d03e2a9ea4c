import { existsSync } from "node:fs";
import { dirname, join, sep } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

/**
 * Where the compiled batch worker is. Worker threads run JavaScript, so the worker always comes from the
 * build: next to this module when it is itself compiled (`dist/src/batch/`), and in the project's
 * `dist/src/batch/` when this module runs from TypeScript source (under vitest or tsx). In the second
 * case the worker, and the fit it imports, are as fresh as the last `npm run build`; the tests check that.
 *
 * @param moduleUrl the URL of the calling module (defaults to this one)
 * @throws Error naming the missing file and the command that makes it
 */
export function compiledWorkerUrl(moduleUrl: string = import.meta.url): URL {
  const here = fileURLToPath(moduleUrl);
  let candidate = join(dirname(here), "fit-worker.js");
  if (here.endsWith(".ts")) {
    const marker = `${sep}src${sep}batch${sep}`;
    const root = here.slice(0, here.lastIndexOf(marker));
    candidate = join(root, "dist", "src", "batch", "fit-worker.js");
  }
  if (!existsSync(candidate)) {
    throw new Error(`the batch worker is missing: ${candidate} (worker threads run compiled code; run "npm run build")`);
  }
  return pathToFileURL(candidate);
}
