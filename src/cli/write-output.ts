import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import type { CliIo } from "./cli-io.js";

/** Writes text to --out (atomically: a temporary file renamed into place) or to stdout when no path is given. */
export function writeOutput(text: string, path: string | undefined, io: CliIo): void {
  if (path === undefined || path === "-") {
    io.stdout(text);
    return;
  }
  const target = resolve(io.cwd, path);
  mkdirSync(dirname(target), { recursive: true });
  const temporary = `${target}.tmp-${process.pid}`;
  writeFileSync(temporary, text);
  renameSync(temporary, target);
}
