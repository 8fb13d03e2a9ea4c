import { existsSync, readFileSync } from "node:fs";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runInProcess } from "./run-cli-in-process.js";

/** The fit-result contract (docs/architecture.md, "Result JSON"): these keys must be present (more may be added). */
const CONTRACT = {
  top: ["model", "seed", "version", "data", "parameters", "diagnostics", "warnings"],
  data: ["n", "dropped", "baseline", "medianCadence", "timeColumn", "valueColumn", "errorColumn"],
  summary: ["median", "mean", "sd", "q2.5", "q16", "q84", "q97.5"],
  diagnostics: ["converged", "rhatMax", "essMin", "autocorrelationTime", "acceptance", "likelihoodEvaluations", "seconds"],
};

describe("command-line workflow: simulate, fit, predict --from, report", () => {
  it("keeps the JSON and CSV contracts and reproduces a fit from its seed", async () => {
    const cwd = mkdtempSync(join(tmpdir(), "horologium-workflow-"));
    const run = (args: string[]) => runInProcess(args, cwd);
    expect((await run(["simulate", "--kernel", "drw(sigma=0.15,tau=30)", "--seasons", "2", "--revisit", "5", "--seed", "3", "--out", "lc.csv"])).code).toBe(0);

    const fit = await run(["fit", "lc.csv", "--model", "drw", "--seed", "5", "--out", "fit.json", "--quiet"]);
    expect(fit.code).toBe(0);
    const result = JSON.parse(readFileSync(join(cwd, "fit.json"), "utf8"));
    for (const key of CONTRACT.top) expect(result).toHaveProperty([key]);
    for (const key of CONTRACT.data) expect(result.data).toHaveProperty([key]);
    for (const key of CONTRACT.diagnostics) expect(result.diagnostics).toHaveProperty([key]);
    expect(Object.keys(result.parameters)).toEqual(["tau", "sigma", "mean"]);
    for (const name of ["tau", "sigma", "mean"]) for (const key of CONTRACT.summary) expect(Number.isFinite(result.parameters[name][key])).toBe(true);
    expect(result.data).toMatchObject({ timeColumn: "time", valueColumn: "mag", errorColumn: "mag_err", dropped: 0 });

    // Same seed, same result, bit for bit (the timing figure aside).
    const again = await run(["fit", "lc.csv", "--model", "drw", "--seed", "5", "--quiet"]);
    const second = JSON.parse(again.stdout);
    expect(second.parameters).toEqual(result.parameters);

    const predict = await run(["predict", "lc.csv", "--from", "fit.json", "--grid", "60000:60800:100", "--out", "pred.csv"]);
    expect(predict.code).toBe(0);
    const lines = readFileSync(join(cwd, "pred.csv"), "utf8").trim().split("\n");
    expect(lines[0]).toBe("time,mean,sd,lower95,upper95");
    expect(lines).toHaveLength(10);
    for (const line of lines.slice(1)) {
      const [time, mean, sd, lower, upper] = line.split(",").map(Number);
      expect(Number.isFinite(time) && sd > 0).toBe(true);
      expect(lower).toBeLessThan(mean);
      expect(upper).toBeGreaterThan(mean);
    }

    const report = await run(["report", "fit.json", "--out", "report", "--quiet"]);
    expect(report.code).toBe(0);
    expect(existsSync(join(cwd, "report", "report.html"))).toBe(true);
    expect(existsSync(join(cwd, "report", "figures", "light-curve.png"))).toBe(true);
  }, 600_000);
});
