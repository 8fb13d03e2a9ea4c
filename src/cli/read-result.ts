import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { InputError } from "../errors/input-error.js";
import type { FitResult } from "../models/fit-result.js";
import { parseFitResult } from "../models/parse-fit-result.js";

/**
 * Reads a fit-result JSON file written by `horologium fit`: one result (a joint multi-band fit is one
 * result), or from the per-band results of `--bands separate` (`{"perBand": {...}}`) the result of `band`. Every key is checked ({@link parseFitResult}); a malformed file, an older format or a missing
 * band ends in one InputError naming the file (and the field).
 */
export function readFitResult(path: string, cwd: string, band?: string): FitResult {
  let text: string;
  try {
    text = readFileSync(resolve(cwd, path), "utf8");
  } catch (error) {
    throw new InputError(`cannot read the file (${(error as NodeJS.ErrnoException).code ?? String(error)})`, { file: path });
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (error) {
    throw new InputError(`not valid JSON (${(error as Error).message})`, { file: path });
  }
  if (isPerBand(parsed)) {
    const names = Object.keys(parsed.perBand);
    if (band === undefined && names.length === 1) return parseFitResult(parsed.perBand[names[0]], path, `band ${names[0]}`);
    if (band === undefined || !(band in parsed.perBand))
      throw new InputError(`the file holds results for bands ${names.join(", ")}; choose one with --band`, { file: path });
    return parseFitResult(parsed.perBand[band], path, `band ${band}`);
  }
  if (!Array.isArray(parsed)) return parseFitResult(parsed, path);
  if (parsed.length === 0) throw new InputError("an empty list: no fit result", { file: path });
  const results = parsed.map((candidate, k) => parseFitResult(candidate, path, parsed.length > 1 ? `result ${k + 1}` : undefined));
  if (results.length === 1) return results[0];
  const chosen = results.find((result) => result.data.band === band);
  if (!chosen) {
    const bands = results.map((result) => result.data.band).join(", ");
    throw new InputError(`the file holds results for bands ${bands}; choose one with --band`, { file: path });
  }
  return chosen;
}

/** The JSON of `fit --bands separate`: `{ "formatVersion", "perBand": { "<band>": result } }`. */
function isPerBand(value: unknown): value is { perBand: Record<string, unknown> } {
  if (value === null || typeof value !== "object" || Array.isArray(value)) return false;
  const perBand = (value as { perBand?: unknown }).perBand;
  return perBand !== null && typeof perBand === "object" && !Array.isArray(perBand);
}

/**
 * What `rebuild` makes from a stored result (its model, its conditioning light curve, its draws), with a
 * RangeError (a parameter of the file outside its range) reported as an InputError naming the result
 * file: shared by `predict --from` and `report`.
 */
export function fromStoredResult<T>(resultPath: string, rebuild: () => T): T {
  try {
    return rebuild();
  } catch (error) {
    if (error instanceof RangeError) throw new InputError(error.message, { file: resultPath });
    throw error;
  }
}
