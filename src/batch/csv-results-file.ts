import { closeSync, openSync, writeFileSync } from "node:fs";
import { DurableAppender, replaceAtomically } from "./durable-file.js";
import type { ResultCell, ResultRow } from "./result-row.js";

/**
 * Formats one cell for CSV (RFC 4180): numbers in JavaScript's shortest round-trip form (so they read
 * back to the same double), NaN and infinities as `NaN`, `Infinity`, `-Infinity`, flags as `true` and
 * `false`, empty cells for null, and text quoted when it holds a comma, a quote or a line break.
 */
export function formatCsvCell(cell: ResultCell | undefined): string {
  if (cell === null || cell === undefined) return "";
  if (typeof cell === "number" || typeof cell === "boolean") return String(cell);
  return /[",\r\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell;
}

/** Formats a row as one CSV line (with its line break), cells in the order of `columns`. */
export function formatCsvLine(columns: readonly string[], row: ResultRow): string {
  return columns.map((column) => formatCsvCell(row[column])).join(",") + "\n";
}

/**
 * A CSV results table written append-only: a header, then one line per object, written as the object
 * is done and flushed to storage in the background (see {@link DurableAppender}). The column set is
 * fixed when the file is opened; cells of columns outside it stay in the journal and the table is
 * rebuilt from the journal at the end of the run (see batch-run.ts).
 */
export class CsvResultsAppender {
  private readonly file: DurableAppender;

  /** Opens `path` for appending; the file must already hold the header (see {@link writeCsvTable}). */
  constructor(
    readonly path: string,
    readonly columns: readonly string[],
  ) {
    this.file = new DurableAppender(path);
  }

  /** Appends one row. */
  append(row: ResultRow): void {
    this.file.append(formatCsvLine(this.columns, row));
  }

  /** Flushes the rows to storage and closes the file. */
  async close(): Promise<void> {
    await this.file.close();
  }
}

/**
 * Writes a whole CSV table atomically (temporary file, flush, rename): the header and every row of
 * `rows`, streamed, so memory does not grow with the number of rows.
 */
export async function writeCsvTable(
  path: string,
  columns: readonly string[],
  rows: AsyncIterable<ResultRow>,
): Promise<number> {
  let count = 0;
  await replaceAtomically(path, async (temporary) => {
    writeFileSync(temporary, columns.map((column) => formatCsvCell(column)).join(",") + "\n");
    const fd = openSync(temporary, "a");
    try {
      let buffer = "";
      for await (const row of rows) {
        buffer += formatCsvLine(columns, row);
        count += 1;
        if (buffer.length > 1 << 20) {
          writeFileSync(fd, buffer);
          buffer = "";
        }
      }
      writeFileSync(fd, buffer);
    } finally {
      closeSync(fd);
    }
  });
  return count;
}
