import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { formatCsvCell, formatCsvLine } from "../../src/batch/csv-results-file.js";
import { decodeJournalRow, encodeJournalRow } from "../../src/batch/journal-codec.js";
import { orderColumns } from "../../src/batch/result-columns.js";
import { okRow, failedRow, withWarnings } from "../../src/batch/result-row.js";
import { parseResultCell, splitCsvRecord } from "../../src/batch/results-table-reader.js";
import { shellQuote } from "../../src/batch/slurm-job-script.js";
import { formatDuration, throughput } from "../../src/batch/throughput.js";
import type { FitResult } from "../../src/models/fit-result.js";
import { inventedFitResult, inventedSummary } from "../helpers/invented-fit-result.js";

const fit: FitResult = inventedFitResult({
  parameters: {
    tau: { median: 210, mean: 230, sd: 40, "q2.5": 150, q16: 180, q84: 270, "q97.5": 330, hdi95: [140, 320] },
    sigma: inventedSummary(0.2, 0.02),
  },
  diagnostics: { ...inventedFitResult().diagnostics, converged: false, rhatMax: Infinity, autocorrelationTime: NaN },
  warnings: ["the baseline is shorter than 10 tau,\nso tau is biased low"],
  derived: { sfInf: { median: 0.28, mean: 0.3, sd: 0.03, "q2.5": 0.22, q16: 0.25, q84: 0.31, "q97.5": 0.36, hdi95: [0.22, 0.36], description: "sqrt(2) sigma" } },
});

describe("result rows", () => {
  it("flatten every parameter statistic, the diagnostics, the data size and the warnings", () => {
    const row = okRow("lf-1", 99, fit);
    expect(row).toMatchObject({ object_id: "lf-1", status: "ok", reason: null, model: "drw", seed: 99 });
    expect(row["data.n"]).toBe(250);
    expect(row["data.dropped"]).toBe(2);
    expect(row["tau.q2.5"]).toBe(150);
    expect(row["tau.hdi95.lower"]).toBe(140);
    expect(row["tau.hdi95.upper"]).toBe(320);
    expect(row["sfInf.q97.5"]).toBe(0.36); // summaries of derived quantities too
    expect(row).not.toHaveProperty(["sfInf.description"]);
    expect(row["diagnostics.rhatMax"]).toBe(Infinity);
    expect(row["diagnostics.converged"]).toBe(false);
    expect(JSON.parse(row.warnings as string)).toEqual(["the baseline is shorter than 10 tau, so tau is biased low"]);
    expect(JSON.parse(withWarnings(row, ["dropped 2 rows"]).warnings as string)).toHaveLength(2);
    expect(failedRow("lf-2", 5, "drw", "bad\r\nthing")).toEqual({ object_id: "lf-2", status: "failed", reason: "bad thing", model: "drw", seed: 5 });
  });

  it("are laid out by kind: identity, data, summaries, diagnostics, warnings", () => {
    const seen = ["object_id", "status", "reason", "model", "seed", "data.n", "tau.median", "diagnostics.converged", "warnings", "sfInf.median", "diagnostics.stopReason", "data.source"];
    expect(orderColumns(seen)).toEqual([
      "object_id", "status", "reason", "model", "seed", "data.n", "data.source", "tau.median", "sfInf.median",
      "diagnostics.converged", "diagnostics.stopReason", "warnings",
    ]);
  });

  it("survive the journal round trip exactly, NaN and infinities included", () => {
    const row = okRow("lf-1", 99, fit);
    const back = decodeJournalRow(encodeJournalRow(row));
    expect(back).toEqual(row);
    expect(Object.keys(back)).toEqual(Object.keys(row));
    expect(() => decodeJournalRow('{"object_id":"x"}')).toThrow();
    expect(() => decodeJournalRow('{"object_id":"x","status":"ok","a":{"b":1}}')).toThrow();
  });
});

describe("results CSV", () => {
  it("quotes as RFC 4180 requires and reads its own lines back", () => {
    // RFC 4180, section 2, rules 6 and 7: fields with commas, quotes or line breaks are quoted, and a
    // quote inside is doubled.
    expect(formatCsvCell('say "hi", twice')).toBe('"say ""hi"", twice"');
    expect(formatCsvCell("plain")).toBe("plain");
    expect(formatCsvCell(null)).toBe("");
    expect(formatCsvCell(0.1 + 0.2)).toBe("0.30000000000000004");
    expect(splitCsvRecord('aaa,"b""bb","c,cc",')).toEqual(["aaa", 'b"bb', "c,cc", ""]);
    expect(splitCsvRecord('"unclosed,x')).toBeUndefined();
    const row = okRow("007", 99, fit);
    const columns = Object.keys(row);
    const fields = splitCsvRecord(formatCsvLine(columns, row).trimEnd())!;
    const back = Object.fromEntries(columns.map((column, c) => [column, parseResultCell(column, fields[c])]));
    expect(back).toEqual({ ...row, reason: null });
    expect(back.object_id).toBe("007"); // ids stay text even when they look like numbers
  });
});

describe("job scripts", () => {
  it("quote words so that bash reads them back unchanged", () => {
    const words = ["plain", "with space", "it's", '"double"', "$HOME", "a;b", "*"];
    const echoed = execFileSync("bash", ["-c", `printf '%s\\n' ${words.map(shellQuote).join(" ")}`], { encoding: "utf8" });
    expect(echoed.split("\n").slice(0, -1)).toEqual(words);
  });
});

describe("throughput", () => {
  it("gives the rate so far and the time left at that rate", () => {
    expect(throughput(30, 90, 60_000)).toEqual({ rate: 0.5, etaSeconds: 120 });
    expect(throughput(0, 90, 1000).rate).toBeUndefined();
    expect(formatDuration(185)).toBe("3m 05s");
    expect(formatDuration(7620)).toBe("2h 07m");
    expect(formatDuration(undefined)).toBe("?");
  });
});
