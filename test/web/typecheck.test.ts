import { execFileSync } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = new URL("../../", import.meta.url).pathname;

/**
 * The page's sources (web/, DOM library) are outside the main tsconfig, and Vite does not typecheck;
 * this keeps a rename elsewhere in src/ from breaking the page unnoticed.
 */
describe("the browser page's sources", () => {
  it("typecheck with web/tsconfig.json", () => {
    let output = "";
    try {
      execFileSync(process.execPath, [join(ROOT, "node_modules/typescript/bin/tsc"), "-p", join(ROOT, "web/tsconfig.json")], { encoding: "utf8" });
    } catch (error) {
      output = String((error as { stdout?: string }).stdout ?? error);
    }
    expect(output).toBe("");
  });
});
