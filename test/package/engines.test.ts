import { readFileSync } from "node:fs";
import { join } from "node:path";
import semver from "semver";
import { describe, expect, it } from "vitest";

const ROOT = new URL("../../", import.meta.url).pathname;
const packageJson = JSON.parse(readFileSync(join(ROOT, "package.json"), "utf8")) as { engines: { node: string } };
const lock = JSON.parse(readFileSync(join(ROOT, "package-lock.json"), "utf8")) as {
  packages: Record<string, { version?: string; engines?: { node?: string } | string[]; dev?: boolean; optional?: boolean }>;
};

/**
 * `npm ci` warns (EBADENGINE) when a locked package's `engines.node` excludes the running Node. The
 * project's own `engines` (package.json) is "^20.19.0 || >=22.12.0": vega-lite's argument parser (yargs 18)
 * and the page's bundler (Vite 8) need Node 20.19, so that is where the range starts (moved on purpose from
 * ">=20"; vega-lite 6.5.0 needed Node 22 and is held at 6.4.3).
 */
describe("the engines of the dependencies", () => {
  const ranges = Object.entries(lock.packages)
    .filter(([path, entry]) => path !== "" && !entry.optional && entry.engines && !Array.isArray(entry.engines) && entry.engines.node)
    .map(([path, entry]) => ({
      name: path.replace(/^.*node_modules\//, ""),
      version: entry.version,
      dev: entry.dev === true,
      range: (entry.engines as { node: string }).node,
    }));
  const refusing = (node: string, dev: boolean) =>
    ranges.filter((r) => (dev || !r.dev) && !semver.satisfies(node, r.range)).map((r) => `${r.name}@${r.version} wants node ${r.range}`);

  it("accept the running Node, which the project's engines allow", () => {
    expect(semver.satisfies(process.versions.node, packageJson.engines.node)).toBe(true);
    expect(refusing(process.versions.node, true)).toEqual([]);
  });

  it("accept the oldest Node 20 and 22 releases the project's engines allow", () => {
    const oldest = semver.minVersion(packageJson.engines.node)!.version;
    expect(oldest).toBe("20.19.0");
    expect(refusing(oldest, true)).toEqual([]);
    expect(refusing("22.12.0", true)).toEqual([]);
    expect(semver.satisfies("22.12.0", packageJson.engines.node)).toBe(true);
  });
});
