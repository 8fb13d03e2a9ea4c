import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { PROJECT_ROOT, requireFreshBuild } from "./build-check.js";

/**
 * The Slurm integration test (scripts/slurm-integration.sh): a real scheduler, started by the script as
 * root, runs a job array over a small simulated catalogue; the merged shards must equal a
 * single-process run. It runs in CI (CI set) or when HOROLOGIUM_SLURM=1; in CI, missing packages are a
 * failure, not a skip (.ci/setup-slurm.sh installs them).
 */
const wanted = Boolean(process.env.CI) || process.env.HOROLOGIUM_SLURM === "1";

function missingCommands(): string[] {
  return ["munged", "slurmctld", "slurmd", "sbatch", "squeue", "scontrol"].filter(
    (command) => spawnSync("bash", ["-c", `command -v ${command}`]).status !== 0,
  );
}

describe.skipIf(!wanted)("horologium batch under Slurm", () => {
  it(
    "fits a catalogue as a job array whose merged shards equal a single-process run",
    () => {
      requireFreshBuild();
      const missing = missingCommands();
      if (missing.length > 0) {
        throw new Error(`Slurm test: ${missing.join(", ")} not installed; run "bash .ci/setup-slurm.sh" as root`);
      }
      if (process.getuid?.() !== 0) throw new Error("Slurm test: must run as root (it starts munged, slurmctld and slurmd)");
      const result = spawnSync("bash", [join(PROJECT_ROOT, "scripts", "slurm-integration.sh")], {
        encoding: "utf8",
        timeout: 12 * 60_000,
        killSignal: "SIGTERM", // the script's trap stops the daemons it started
      });
      const output = `${result.stdout}\n${result.stderr}`;
      expect(result.status, output).toBe(0);
      expect(result.stdout).toContain("PASSED: the merged job-array results equal the single-process run");
    },
    13 * 60_000,
  );
});
