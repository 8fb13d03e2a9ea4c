import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { UsageError } from "../../src/errors/usage-error.js";
import { fitArgumentList, fitArguments } from "../../src/cli/fit-arguments.js";
import { parseVerbArguments } from "../../src/cli/verb-arguments.js";
import { CATALOGUE_FIT_OPTIONS, catalogueFitChoice } from "../../src/cli/verbs/batch/catalogue-fit-arguments.js";
import { runInProcess } from "./run-cli-in-process.js";

const LIGHT_CURVE = "time,mag,mag_err\n" + Array.from({ length: 30 }, (_, i) => `${i * 1.5},${(19 + 0.1 * Math.sin(i)).toFixed(4)},0.02`).join("\n") + "\n";

/** Every bad fit option, and the one message that every fitting verb gives for it. */
const BAD_OPTIONS: readonly [string[], string][] = [
  [["--seed=-3"], '--seed must be a non-negative integer, got "-3"'],
  [["--seed", "1.5"], '--seed must be a non-negative integer, got "1.5"'],
  [["--max-evaluations", "2.5"], '--max-evaluations must be a positive integer, got "2.5"'],
  [["--max-evaluations", "0"], '--max-evaluations must be a positive integer, got "0"'],
  [["--background", "oscillator"], '--background must be drw, got "oscillator"'],
  [["--redshift=-1"], '--redshift must be a number >= 0, got "-1"'],
  [["--redshift", "far"], '--redshift must be a number, got "far"'],
  [["--sampler", "gibbs"], '--sampler must be nuts or ensemble, got "gibbs"'],
  [["--unit", "jansky"], '--unit must be mag or flux, got "jansky"'],
  [["--min-period", "5", "--max-period", "2"], "--min-period (5) must be below --max-period (2)"],
];

describe("fitArguments: one set of rules for every verb that fits", () => {
  it("reads valid options, with exponent notation for integers", () => {
    const values = { model: "drw", seed: "0", "max-evaluations": "2e6", redshift: "1.62", background: "drw", robust: true, sampler: "nuts" };
    const choice = fitArguments(values, true);
    expect(choice).toEqual({ model: "drw", seed: 0, maxEvaluations: 2e6, redshift: 1.62, background: "drw", robust: true, sampler: "nuts" });
    // Written back as arguments, the choice reads again to itself (how batch plan hands it to its tasks).
    const list = fitArgumentList(choice);
    const again: Record<string, string | boolean> = {};
    for (let k = 0; k < list.length; k++) {
      const name = list[k].slice(2);
      if (list[k + 1] === undefined || list[k + 1].startsWith("--")) again[name] = true;
      else again[name] = list[++k];
    }
    expect(fitArguments(again, true)).toEqual(choice);
  });

  it("defaults the seed to 1 and requires the model only when asked", () => {
    expect(fitArguments({}, false)).toEqual({ seed: 1 });
    expect(() => fitArguments({}, true)).toThrow(new UsageError("--model is required (drw, oscillator, quasi-periodic, carma)"));
    expect(() => fitArguments({ model: "sine" }, false)).toThrow('--model must be one of drw, oscillator, quasi-periodic, carma, got "sine"');
  });
});

describe("batch plan: the arguments written into the job script", () => {
  it("read back to the same choice, flags included (the tasks fit exactly as asked)", () => {
    const io = { stdout: () => undefined, stderr: () => undefined, stderrIsTty: false, env: {}, cwd: "/lds", now: () => 0 };
    const args = ["--model", "oscillator", "--seed", "7", "--robust", "--unit", "flux", "--keep-placeholders", "--id-col", "objid", "--error-col", "none", "--timeout", "30", "--min-period", "0.5"];
    const parse = (list: string[]) => parseVerbArguments(list, CATALOGUE_FIT_OPTIONS, "", () => undefined)!.values;
    const first = catalogueFitChoice(parse(args), io);
    const again = catalogueFitChoice(parse([...first.arguments]), io);
    expect(again).toEqual(first);
    expect(first.read).toEqual({ unit: "flux", keepPlaceholders: true, idColumn: "objid", errorColumn: null });
    expect(first.fit).toEqual({ model: "oscillator", seed: 7, robust: true, minimumPeriod: 0.5 });
  });
});

describe("the same bad option gives the same one-line error in fit, predict, compare, batch and batch plan", () => {
  const cwd = mkdtempSync(join(tmpdir(), "horologium-fit-arguments-"));
  writeFileSync(join(cwd, "lc.csv"), LIGHT_CURVE);
  mkdirSync(join(cwd, "catalogue"));
  writeFileSync(join(cwd, "catalogue", "lds-1.csv"), LIGHT_CURVE);
  const verbs: Record<string, string[]> = {
    fit: ["fit", "lc.csv", "--model", "drw"],
    predict: ["predict", "lc.csv", "--model", "drw", "--grid", "0:1:1"],
    batch: ["batch", "catalogue", "--model", "drw", "--out", "results.csv"],
    "batch plan": ["batch", "plan", "catalogue", "--model", "drw", "--shards", "2", "--out-dir", "plan"],
  };
  for (const [option, message] of BAD_OPTIONS) {
    it(`${option.join(" ")}`, async () => {
      for (const [name, args] of Object.entries(verbs)) {
        const { code, stderr } = await runInProcess([...args, ...option], cwd);
        expect(code, name).toBe(2);
        expect(stderr, name).toBe(`horologium ${name.split(" ")[0]}: ${message}\n`);
      }
      if (/^--(seed|background|min-period)/.test(option[0])) {
        const { stderr } = await runInProcess(["compare", "lc.csv", ...option], cwd);
        expect(stderr).toBe(`horologium compare: ${message}\n`);
      }
    });
  }
});
