import { readdirSync } from "node:fs";
import { join } from "node:path";

/** The project's source folder. */
export const SOURCE_ROOT = join(import.meta.dirname, "..", "..", "src");

/** Every TypeScript source below `folder` (declaration files excluded), for checks on the syntax tree. */
export function sourceFiles(folder: string): string[] {
  return readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const path = join(folder, entry.name);
    if (entry.isDirectory()) return sourceFiles(path);
    return entry.name.endsWith(".ts") && !entry.name.endsWith(".d.ts") ? [path] : [];
  });
}
