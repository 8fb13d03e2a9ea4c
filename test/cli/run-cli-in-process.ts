import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli } from "../../src/cli/main.js";

/** Runs the command line in-process with captured output, in `cwd` (a fresh temporary folder by default). */
export async function runInProcess(args: string[], cwd = mkdtempSync(join(tmpdir(), "horologium-cli-"))) {
  let stdout = "";
  let stderr = "";
  const code = await runCli(args, {
    stdout: (text) => void (stdout += text),
    stderr: (text) => void (stderr += text),
    stderrIsTty: false,
    env: {},
    cwd,
    now: () => 0,
  });
  return { code, stdout, stderr, cwd };
}
