import { asyncBufferFromFile, parquetMetadataAsync, parquetReadObjects } from "hyparquet";
import { InputError } from "../errors/input-error.js";
import { fileLines } from "./file-lines.js";
import { TEXT_COLUMNS, type ResultCell, type ResultRow } from "./result-row.js";

/**
 * Splits one line of a results CSV (RFC 4180: fields separated by commas, quoted with double quotes,
 * quotes doubled inside quotes). Returns undefined when a quoted field is not closed.
 */
export function splitCsvRecord(line: string): string[] | undefined {
  const fields: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let text = "";
      i += 1;
      for (;;) {
        const close = line.indexOf('"', i);
        if (close === -1) return undefined;
        text += line.slice(i, close);
        if (line[close + 1] === '"') {
          text += '"';
          i = close + 2;
        } else {
          i = close + 1;
          break;
        }
      }
      fields.push(text);
      if (i < line.length && line[i] !== ",") return undefined;
    } else {
      const comma = line.indexOf(",", i);
      const end = comma === -1 ? line.length : comma;
      fields.push(line.slice(i, end));
      i = end;
    }
    if (i >= line.length) return fields;
    i += 1; // the comma
    if (i === line.length) {
      fields.push("");
      return fields;
    }
  }
}

/**
 * The value of a results CSV cell: empty is null; in a text column ({@link TEXT_COLUMNS}) the text itself;
 * elsewhere `true`/`false` are flags and numbers (with NaN, Infinity, -Infinity) are numbers.
 */
export function parseResultCell(column: string, text: string): ResultCell {
  if (text === "") return null;
  if (TEXT_COLUMNS.has(column)) return text;
  if (text === "true") return true;
  if (text === "false") return false;
  if (text === "NaN") return NaN;
  const number = Number(text);
  return Number.isNaN(number) || text.trim() !== text ? text : number;
}

/**
 * Streams the rows of a results table written by `horologium batch` (CSV or Parquet, by extension), so
 * that shard tables can be merged without holding them in memory. Throws {@link InputError} naming the
 * file and line for a table that is not a results table.
 */
export async function* readResultsTable(path: string): AsyncGenerator<ResultRow> {
  if (/\.parquet$/i.test(path)) {
    yield* readParquetResults(path);
    return;
  }
  let columns: string[] | undefined;
  try {
    for await (const line of fileLines(path)) {
      const text = line.text.endsWith("\r") ? line.text.slice(0, -1) : line.text;
      if (!line.terminated && text === "") continue;
      const fields = splitCsvRecord(text);
      if (!fields) throw new InputError("unclosed quote", { file: path, line: line.number });
      if (!columns) {
        columns = fields;
        if (!columns.includes("object_id") || !columns.includes("status")) {
          throw new InputError("not a batch results table (no object_id and status columns)", { file: path, line: 1 });
        }
        continue;
      }
      if (!line.terminated) {
        throw new InputError("the last line is cut short (was the run interrupted? resume it first)", {
          file: path,
          line: line.number,
        });
      }
      if (fields.length !== columns.length) {
        throw new InputError(`${fields.length} fields where the header has ${columns.length}`, {
          file: path,
          line: line.number,
        });
      }
      const row: Record<string, ResultCell> = {};
      for (let c = 0; c < columns.length; c++) row[columns[c]] = parseResultCell(columns[c], fields[c]);
      yield row;
    }
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") throw new InputError("no such file", { file: path });
    throw error;
  }
  if (!columns) throw new InputError("empty file, not a batch results table", { file: path });
}

async function* readParquetResults(path: string): AsyncGenerator<ResultRow> {
  let file;
  try {
    file = await asyncBufferFromFile(path);
  } catch {
    throw new InputError("cannot read the file", { file: path });
  }
  let rows: number;
  try {
    rows = Number((await parquetMetadataAsync(file)).num_rows);
  } catch (error) {
    throw new InputError(`not a Parquet file (${(error as Error).message})`, { file: path });
  }
  const chunk = 10_000;
  for (let start = 0; start < rows; start += chunk) {
    const objects = await parquetReadObjects({ file, rowStart: start, rowEnd: Math.min(rows, start + chunk) });
    for (const [offset, object] of objects.entries()) {
      if (typeof object.object_id !== "string" || typeof object.status !== "string") {
        throw new InputError("not a batch results table (no object_id and status)", { file: path, line: start + offset + 1 });
      }
      const row: Record<string, ResultCell> = {};
      for (const [column, value] of Object.entries(object)) {
        row[column] = value === undefined ? null : typeof value === "bigint" ? Number(value) : (value as ResultCell);
      }
      yield row;
    }
  }
}
