import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { inventedFitResult } from "../helpers/invented-fit-result.js";
import { VERB_NAMES } from "../../src/cli/main.js";
import { runInProcess } from "./run-cli-in-process.js";

/** Every input or usage problem ends in exactly one line on stderr, exit code 2, and no stack trace. */
async function expectOneLineError(args: string[], pattern: RegExp, files: Record<string, string> = {}) {
  const { mkdtempSync } = await import("node:fs");
  const { tmpdir } = await import("node:os");
  const cwd = mkdtempSync(join(tmpdir(), "horologium-cli-"));
  for (const [name, text] of Object.entries(files)) writeFileSync(join(cwd, name), text);
  const { code, stderr } = await runInProcess(args, cwd);
  expect(code).toBe(2);
  expect(stderr.trimEnd().split("\n")).toHaveLength(1);
  expect(stderr).toMatch(pattern);
  expect(stderr).not.toMatch(/\n\s+at /);
}

const GOOD = "time,mag,mag_err\n" + Array.from({ length: 30 }, (_, i) => `${i * 1.5},${(19 + 0.1 * Math.sin(i)).toFixed(4)},0.02`).join("\n") + "\n";

describe("command-line errors", () => {
  it("unknown verb and unknown option", async () => {
    await expectOneLineError(["fitt"], /unknown verb "fitt"/);
    await expectOneLineError(["fit", "lc.csv", "--model", "drw", "--colour", "red"], /unknown option --colour/, { "lc.csv": GOOD });
  });

  it("fit: missing or wrong model, missing file, garbage cell with file, line and column", async () => {
    await expectOneLineError(["fit", "lc.csv"], /--model is required/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "lc.csv", "--model", "spline"], /--model must be one of drw, oscillator, quasi-periodic, carma/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "lc.csv", "--model", "carma"], /--model carma needs --order p,q/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "lc.csv", "--model", "carma", "--order", "2,2"], /--order: the CARMA order needs q < p/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "missing.csv", "--model", "drw"], /missing\.csv.*cannot read/);
    const bad = GOOD.replace("\n3,", "\nthree,");
    await expectOneLineError(["fit", "lc.csv", "--model", "drw"], /lc\.csv:4: column "time"/, { "lc.csv": bad });
    const negative = GOOD.replace(/0\.02\n/, "-0.02\n");
    await expectOneLineError(["fit", "lc.csv", "--model", "drw"], /lc\.csv:2: column "mag_err"/, { "lc.csv": negative });
    await expectOneLineError(["fit", "lc.csv", "--model", "drw", "--time-col", "hjd"], /lc\.csv.*hjd/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "lc.csv", "--model", "drw", "--seed", "1.5"], /--seed must be a non-negative integer/, { "lc.csv": GOOD });
    await expectOneLineError(["fit", "lc.csv", "--model", "drw", "--redshift=-1"], /--redshift must be a number >= 0/, { "lc.csv": GOOD });
  });

  it("predict: times, grid and --from problems", async () => {
    await expectOneLineError(["predict", "lc.csv", "--model", "drw"], /exactly one of --at FILE or --grid/, { "lc.csv": GOOD });
    await expectOneLineError(["predict", "lc.csv", "--model", "drw", "--grid", "0:10"], /--grid must be start:stop:step/, { "lc.csv": GOOD });
    await expectOneLineError(["predict", "lc.csv", "--model", "drw", "--grid", "0:10:0"], /--grid step must be > 0/, { "lc.csv": GOOD });
    await expectOneLineError(["predict", "lc.csv", "--model", "drw", "--at", "t.csv"], /t\.csv:3: column "time": "soon" is not a finite time/, {
      "lc.csv": GOOD,
      "t.csv": "time\n1\nsoon\n",
    });
    await expectOneLineError(["predict", "lc.csv", "--from", "r.json", "--grid", "0:1:1"], /r\.json: not valid JSON/, { "lc.csv": GOOD, "r.json": "{oops" });
    await expectOneLineError(["predict", "lc.csv", "--from", "r.json", "--grid", "0:1:1"], /r\.json: not a horologium fit result/, { "lc.csv": GOOD, "r.json": '{"model":"drw"}' });
    // A result of the first format (no formatVersion), and one with a field of the wrong type.
    const older = JSON.stringify({ model: "drw", seed: 1, parameters: {}, diagnostics: { rhatMax: 1.2 } });
    await expectOneLineError(["predict", "lc.csv", "--from", "r.json", "--grid", "0:1:1"], /r\.json: written by an older version of horologium/, { "lc.csv": GOOD, "r.json": older });
    await expectOneLineError(["report", "r.json"], /r\.json: written by an older version of horologium/, { "r.json": older });
    const malformed = JSON.stringify({ ...inventedFitResult(), data: { ...inventedFitResult().data, n: "thirty" } });
    await expectOneLineError(["predict", "lc.csv", "--from", "r.json", "--grid", "0:1:1"], /r\.json: field "data\.n" must be a non-negative integer, got "thirty"/, { "lc.csv": GOOD, "r.json": malformed });
  });

  it("simulate: kernel expression problems name the parameter", async () => {
    await expectOneLineError(["simulate", "--kernel", "drw(sigma=0.1)"], /drw\(\.\.\.\) needs tau/);
    await expectOneLineError(["simulate", "--kernel", "drw(sigma=-0.1,tau=3)"], /sigma must be a finite number > 0, got -0.1/);
    await expectOneLineError(["simulate", "--kernel", "sine(a=1)"], /unknown kernel "sine"/);
    await expectOneLineError(["simulate", "--kernel", "drw(sigma=0.1,tau=3)", "--cadence", "hourly"], /--cadence must be seasonal or continuous/);
  });

  it("periodogram, compare and report argument problems", async () => {
    await expectOneLineError(["periodogram", "lc.csv", "--min-period", "5", "--max-period", "2"], /--min-period \(5\) must be below --max-period \(2\)/, { "lc.csv": GOOD });
    await expectOneLineError(["compare", "lc.csv", "--models", "drw,sho"], /--models must be one of drw, oscillator, quasi-periodic, carma, got "sho"/, { "lc.csv": GOOD });
    await expectOneLineError(["report", "nothing.json"], /nothing\.json: cannot read the file/);
  });

  it("every verb answers --help with an example", async () => {
    // Every registered verb (cli/main.ts): a verb added there is checked here without an edit.
    expect(VERB_NAMES).toEqual(expect.arrayContaining(["fit", "predict", "simulate", "periodogram", "compare", "report", "batch", "demo"]));
    for (const verb of VERB_NAMES) {
      const { code, stdout } = await runInProcess([verb, "--help"]);
      expect(code).toBe(0);
      expect(stdout).toMatch(/Usage: horologium/);
    }
  });
});
