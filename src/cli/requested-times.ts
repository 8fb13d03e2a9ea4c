import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { InputError } from "../errors/input-error.js";
import { UsageError } from "../errors/usage-error.js";

/** Largest prediction grid accepted, so that a typo cannot ask for billions of points. */
export const MAX_GRID_POINTS = 1_000_000;

/** Times start, start + step, ... up to stop (inclusive within rounding) from "start:stop:step". */
export function parseGrid(text: string): Float64Array {
  const parts = text.split(":").map((p) => Number(p));
  if (parts.length !== 3 || parts.some((p, i) => text.split(":")[i].trim() === "" || !Number.isFinite(p)))
    throw new UsageError(`--grid must be start:stop:step with three numbers, got "${text}"`);
  const [start, stop, step] = parts;
  if (!(step > 0)) throw new UsageError(`--grid step must be > 0, got ${step}`);
  if (!(stop >= start)) throw new UsageError(`--grid stop (${stop}) must not be below start (${start})`);
  const count = Math.floor((stop - start) / step + 1e-9) + 1;
  if (count > MAX_GRID_POINTS) throw new UsageError(`--grid asks for ${count} points; at most ${MAX_GRID_POINTS}`);
  return Float64Array.from({ length: count }, (_, i) => start + i * step);
}

/**
 * Reads requested times from a text file: one time per line, or a CSV whose column "time" (or "t",
 * "mjd", "jd", "bjd"; else the first column) holds them. Blank and # comment lines are skipped; anything
 * else that is not a finite number is an InputError naming the line.
 */
export function readTimesFile(path: string, cwd: string): Float64Array {
  const file = resolve(cwd, path);
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (error) {
    throw new InputError(`cannot read the file (${(error as NodeJS.ErrnoException).code ?? String(error)})`, { file: path });
  }
  const lines = text.split(/\r?\n/);
  let column = 0;
  let columnName = "time";
  const times: number[] = [];
  let headerSeen = false;
  lines.forEach((raw, index) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const fields = line.split(/[,\t;]|\s+/).map((f) => f.trim());
    if (!headerSeen) {
      headerSeen = true;
      if (!Number.isFinite(Number(fields[0])) || fields[0] === "") {
        const names = fields.map((f) => f.toLowerCase().replace(/^"|"$/g, ""));
        const found = ["time", "t", "mjd", "jd", "bjd"].map((n) => names.indexOf(n)).find((i) => i >= 0);
        column = found ?? 0;
        columnName = fields[column];
        return;
      }
    }
    const value = Number(fields[column]);
    if (fields[column] === undefined || fields[column] === "" || !Number.isFinite(value))
      throw new InputError(`"${fields[column] ?? ""}" is not a finite time`, { file: path, line: index + 1, column: columnName });
    times.push(value);
  });
  if (times.length === 0) throw new InputError("no times found", { file: path });
  return Float64Array.from(times);
}
