import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository root. */
export const PROJECT_ROOT = fileURLToPath(new URL("../..", import.meta.url));

/**
 * The batch workers (and the CLI run in a child process) execute compiled JavaScript from dist/, while
 * vitest runs the TypeScript sources. This throws, with the command to run, when dist/ is missing or
 * older than any source file of src/batch or src/cli, so a test never exercises stale code silently.
 * (CI builds before testing; locally run `npm run build` after changing these files.)
 */
export function requireFreshBuild(): void {
  const stale: string[] = [];
  for (const folder of ["src/batch", "src/cli", "src/cli/verbs"]) {
    const source = join(PROJECT_ROOT, folder);
    if (!existsSync(source)) continue;
    for (const name of readdirSync(source)) {
      if (!name.endsWith(".ts")) continue;
      const compiled = join(PROJECT_ROOT, "dist", folder, name.replace(/\.ts$/, ".js"));
      if (!existsSync(compiled) || statSync(compiled).mtimeMs < statSync(join(source, name)).mtimeMs) {
        stale.push(`${folder}/${name}`);
      }
    }
  }
  if (stale.length > 0) {
    throw new Error(
      `dist/ is missing or older than ${stale.slice(0, 3).join(", ")}${stale.length > 3 ? ", ..." : ""}: ` +
        'the batch tests run compiled workers; run "npm run build" first',
    );
  }
}

/** The URL of a fit module among the test fixtures. */
export function fixtureModule(name: string): string {
  return new URL(`./fixtures/${name}`, import.meta.url).href;
}
