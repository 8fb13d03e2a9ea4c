import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository root. */
export const PROJECT_ROOT = fileURLToPath(new URL("../..", import.meta.url));

/**
 * The batch workers (and the CLI run in a child process) execute compiled JavaScript from dist/, while
 * vitest runs the TypeScript sources. This throws, with the command to run, when dist/ is missing or
 * older than a source file of src/batch or of the command line, so a test never exercises stale code
 * silently.
 * (CI builds before testing; locally run `npm run build` after changing these files.)
 */
export function requireFreshBuild(): void {
  const sourcesOf = (folder: string) =>
    readdirSync(join(PROJECT_ROOT, folder))
      .filter((name) => name.endsWith(".ts"))
      .map((name) => `${folder}/${name}`);
  const sources = [
    ...sourcesOf("src/batch"),
    ...sourcesOf("src/cli/verbs/batch"),
    "src/cli/main.ts",
    "src/cli/bin.ts",
    "src/cli/cli-io.ts",
  ];
  const stale = sources.filter((source) => {
    const compiled = join(PROJECT_ROOT, "dist", source.replace(/\.ts$/, ".js"));
    return !existsSync(compiled) || statSync(compiled).mtimeMs < statSync(join(PROJECT_ROOT, source)).mtimeMs;
  });
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
