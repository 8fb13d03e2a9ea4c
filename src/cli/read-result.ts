import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { InputError } from "../errors/input-error.js";
import type { FitResult } from "../models/fit-result.js";
import { parseFitResult } from "../models/parse-fit-result.js";

/**
 * Reads a fit-result JSON file written by `horologium fit`: one result, or for a multi-band file the result
 * of `band`. Every key is checked ({@link parseFitResult}); a malformed file, an older format or a missing
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
  if (!Array.isArray(parsed)) return parseFitResult(parsed, path);
  if (parsed.length === 0) throw new InputError("an empty list: no fit result", { file: path });
  const results = parsed.map((candidate, k) => parseFitResult(candidate, path, parsed.length > 1 ? `result ${k + 1}` : undefined));
  if (results.length === 1) return results[0]!;
  const chosen = results.find((result) => result.data.band === band);
  if (!chosen) {
    const bands = results.map((result) => result.data.band).join(", ");
    throw new InputError(`the file holds results for bands ${bands}; choose one with --band`, { file: path });
  }
  return chosen;
}
