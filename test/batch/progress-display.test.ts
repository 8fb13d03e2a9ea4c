import { describe, expect, it } from "vitest";
import type { BatchProgress } from "../../src/batch/batch-run.js";
import { progressDisplay } from "../../src/batch/progress-display.js";

const at = (recorded: number, elapsedMs: number): BatchProgress => ({ recorded, ok: recorded - 1, failed: 1, resumed: 0, toDo: 10, elapsedMs });

describe("progress", () => {
  it("is a status line at most every interval when stderr is not a terminal (a Slurm log)", () => {
    let clock = 0;
    let written = "";
    const display = progressDisplay({ write: (text) => (written += text), isTerminal: false, now: () => clock, lineIntervalMs: 30_000 });
    clock = 10_000;
    display.update(at(2, 10_000)); // too soon for a line
    clock = 40_000;
    display.update(at(4, 40_000));
    clock = 50_000;
    display.update(at(5, 50_000)); // too soon again
    display.stop();
    // 4 fits in 40 s: 0.1 fits/s; 6 left at that rate: 60 s
    expect(written).toBe("batch: 4/10 done, 1 failed, 0.10 fits/s, ETA 1m 00s\n");
  });

  it("is a bar with counts, rate and time left on a terminal", () => {
    let written = "";
    const display = progressDisplay({ write: (text) => (written += text), isTerminal: true, now: () => 0 });
    display.update(at(0, 0));
    display.update(at(5, 10_000));
    display.stop();
    expect(written).toContain("5/10 done, 1 failed | 0.50 fits/s | ETA 10s");
  });
});
