import { fileWriter, parquetWriteRows } from "hyparquet-writer";
import { replaceAtomically } from "./durable-file.js";
import { TEXT_COLUMNS, type ResultCell, type ResultRow } from "./result-row.js";

/** The Parquet type of a results column. */
export type ResultColumnType = "DOUBLE" | "BOOLEAN" | "STRING";

/**
 * Tracks, column by column, which kinds of value occur, to choose Parquet types: numbers only gives
 * DOUBLE, flags only gives BOOLEAN, anything else (or a column in {@link TEXT_COLUMNS}) gives STRING.
 * A column that is empty in every row is DOUBLE (an unfitted parameter) unless it is a text column.
 */
export class ColumnTypeTracker {
  private readonly kinds = new Map<string, Set<string>>();

  /** Notes the cells of one row. */
  observe(row: ResultRow): void {
    for (const [column, cell] of Object.entries(row)) {
      let kinds = this.kinds.get(column);
      if (!kinds) this.kinds.set(column, (kinds = new Set()));
      if (cell !== null) kinds.add(typeof cell);
    }
  }

  /** The type chosen for a column. */
  typeOf(column: string): ResultColumnType {
    if (TEXT_COLUMNS.has(column)) return "STRING";
    const kinds = this.kinds.get(column) ?? new Set<string>();
    if (kinds.size === 0 || (kinds.size === 1 && kinds.has("number"))) return "DOUBLE";
    if (kinds.size === 1 && kinds.has("boolean")) return "BOOLEAN";
    return "STRING";
  }
}

function convertCell(cell: ResultCell | undefined, type: ResultColumnType): string | number | boolean | null {
  if (cell === null || cell === undefined) return null;
  if (type === "STRING") return typeof cell === "string" ? cell : String(cell);
  return cell;
}

/**
 * Writes a results table as Parquet (with hyparquet-writer), atomically via a temporary file and a
 * rename. Rows are streamed in row groups, so memory is bounded by the row-group size (10 000 rows),
 * not by the catalogue. `metadata` goes into the file's key-value metadata.
 */
export async function writeParquetTable(
  path: string,
  columns: readonly string[],
  types: ColumnTypeTracker,
  rows: AsyncIterable<ResultRow>,
  metadata: Record<string, string> = {},
): Promise<number> {
  const typed = columns.map((name) => ({ name, type: types.typeOf(name) }));
  let count = 0;
  async function* converted(): AsyncGenerator<Record<string, string | number | boolean | null>> {
    for await (const row of rows) {
      const out: Record<string, string | number | boolean | null> = {};
      for (const { name, type } of typed) out[name] = convertCell(row[name], type);
      count += 1;
      yield out;
    }
  }
  await replaceAtomically(path, async (temporary) => {
    const writer = fileWriter(temporary);
    await parquetWriteRows({
      writer,
      rows: converted(),
      columns: typed.map(({ name, type }) => ({ name, type, nullable: true })),
      rowGroupSize: 10_000,
      kvMetadata: Object.entries(metadata).map(([key, value]) => ({ key, value })),
      createdBy: "horologium batch",
    }); // finishes the writer itself
  });
  return count;
}
