import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runInProcess } from "../cli/run-cli-in-process.js";
import { caseCsv, type FitCase } from "../helpers/fit-property-case.js";

/**
 * Degenerate data (issue 12): a constant light curve fitted with --model quasi-periodic ended in
 * "internal error: the values have no scatter, so there is no periodogram". Whatever the data cannot
 * support ends in one line saying so and exit 2.
 */
async function fitCsv(rows: string, ...args: string[]) {
  const run = await runInProcess(["--version"]);
  const path = join(run.cwd, "lc.csv");
  writeFileSync(path, "mjd,mag,mag_err\n" + rows);
  return runInProcess(["fit", path, "--quiet", "--max-evaluations", "20000", ...args], run.cwd);
}

const rowsOf = (n: number, value: (i: number) => number, time: (i: number) => number = (i) => 59000 + 3.1 * i) =>
  Array.from({ length: n }, (_, i) => `${time(i)},${value(i)},0.02`).join("\n") + "\n";

function expectOneLine(result: { code: number; stderr: string }, pattern: RegExp) {
  expect(result.code).toBe(2);
  expect(result.stderr.trim().split("\n")).toHaveLength(1);
  expect(result.stderr).not.toMatch(/internal error/);
  expect(result.stderr).toMatch(pattern);
}

describe("data that cannot support a fit", () => {
  it("a constant light curve: one line, exit 2, for every model", async () => {
    for (const model of ["quasi-periodic", "oscillator", "drw"]) {
      expectOneLine(await fitCsv(rowsOf(40, () => 17.25), "--model", model), /all 40 values are equal \(17\.25\)/);
    }
  });

  it("fewer points than parameters", async () => {
    expectOneLine(await fitCsv(rowsOf(6, (i) => 17 + 0.1 * Math.sin(i)), "--model", "quasi-periodic", "--background", "drw"), /only 6 points for the 7 parameters/);
  });

  it("all points at one time", async () => {
    expectOneLine(await fitCsv(rowsOf(10, (i) => 17 + 0.01 * i, () => 59000), "--model", "drw"), /times are equal|one time/);
  });

  it("a baseline shorter than the shortest period searched", async () => {
    expectOneLine(
      await fitCsv(rowsOf(30, (i) => 17 + 0.1 * Math.sin(i)), "--model", "quasi-periodic", "--min-period", "200"),
      /cannot support a period search/,
    );
    expectOneLine(await fitCsv(rowsOf(30, (i) => 17 + 0.1 * Math.sin(i)), "--model", "oscillator", "--min-period", "5", "--max-period", "4"), /--min-period \(5\) must be below --max-period \(4\)/);
  });

  it("errors too small for double precision at a dense cadence: one line naming the cause and the cure", async () => {
    // Case 474111 of the long property run (test/slow/fit-properties.test.ts): 89,585 fluxes in one season,
    // errors 2e-8 of the spread; every start of the oscillator's search had a covariance that cannot be
    // factorised, and the fit ended in "maximum a posteriori: the log density is not finite at any starting point".
    const c: FitCase = { cadence: "single-season", n: 89585, unit: "flux", logError: -6, outliers: 0, timeOffset: 2460000, model: "oscillator", robust: false, seed: 474111 };
    const run = await runInProcess(["--version"]);
    const path = join(run.cwd, "dense.csv");
    writeFileSync(path, caseCsv(c));
    const result = await runInProcess(["fit", path, "--quiet", "--max-evaluations", "40000", "--model", "oscillator", "--seed", "474111"], run.cwd);
    expectOneLine(result, /dense\.csv: the oscillator model's covariance cannot be factorised at any starting point: the errors \(median [\d.e-]+ of the values' spread\) are too small .*\(--jitter\)/);
  }, 120_000);

  it("placeholder rows do not count as measurements", async () => {
    const rows = rowsOf(3, (i) => 17 + 0.1 * i) + "59100,99,99\n59101,99.99,0.1\n59102,18,-999\n";
    expectOneLine(await fitCsv(rows, "--model", "drw"), /only 3 usable point\(s\) after dropping 3 with missing values or placeholder codes/);
  });
});
