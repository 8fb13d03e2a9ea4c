import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { InputError } from "../errors/input-error.js";
import type { FitResult } from "../models/fit-result.js";

/** Reads a fit-result JSON file (one result; for a multi-band file the result of `band`). */
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
  const candidates = (Array.isArray(parsed) ? parsed : [parsed]) as Record<string, unknown>[];
  for (const [k, candidate] of candidates.entries()) {
    for (const key of ["model", "data", "parameters", "diagnostics"])
      if (!candidate || typeof candidate !== "object" || !(key in candidate))
        throw new InputError(`result ${k} has no "${key}" field: not a horologium fit result`, { file: path });
  }
  if (candidates.length === 1) return candidates[0] as unknown as FitResult;
  const chosen = candidates.find((c) => (c.data as { band?: string }).band === band);
  if (!chosen) {
    const bands = candidates.map((c) => (c.data as { band?: string }).band).join(", ");
    throw new InputError(`the file holds results for bands ${bands}; choose one with --band`, { file: path });
  }
  return chosen as unknown as FitResult;
}
