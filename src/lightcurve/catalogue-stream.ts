import { createReadStream } from "node:fs";
import { createInterface } from "node:readline";
import type { Readable } from "node:stream";
import { createGunzip } from "node:zlib";
import { finishObject, newObjectRows, notContiguous, type CatalogueEntry, type ObjectRows } from "./catalogue-object-rows.js";
import { chooseColumns, findColumn, type ColumnChoice } from "./column-choice.js";
import { isSkippableLine } from "./delimited-text.js";
import {
  bandField,
  layoutColumnNames,
  LAYOUT_SCAN_LINES,
  numericField,
  requireDelimitedLayout,
  rowFields,
  type DelimitedReadOptions,
} from "./delimited-light-curve.js";
import { InputError } from "../errors/input-error.js";
import { formatFromName } from "./light-curve-format.js";
import { streamParquetCatalogue } from "./parquet-catalogue-stream.js";

/** Options of {@link streamCatalogue}: the light-curve reader's options plus the object-id column. */
export interface CatalogueStreamOptions extends DelimitedReadOptions {
  /** The column holding object ids (name, or 1-based number). */
  readonly idColumn: string;
}

export type { CatalogueEntry } from "./catalogue-object-rows.js";

/**
 * Streams a delimited-text catalogue (CSV, TSV, whitespace; optionally .gz) holding many objects, one
 * row per observation and an object-id column (a Parquet table goes to {@link streamParquetCatalogue}), yielding one object at a time so memory stays flat
 * whatever the file size. Requirement: the rows of each object must be contiguous (the file grouped
 * or sorted by id, as `sort` or a database export gives); an id that reappears after another object
 * ends the stream with an InputError naming the line. Within an object, rows may be in any time order.
 *
 * Problems of the file as a whole (unreadable, no layout, unknown columns, non-contiguous ids, a row
 * without an id) throw an InputError. Problems of one object's data (a garbage cell, a bad error, too
 * few points) are yielded as that object's `problem`, and the stream goes on.
 *
 * @example for await (const { id, lightCurve, problem } of streamCatalogue("survey.csv", { idColumn: "objid" })) ...
 */
export async function* streamCatalogue(path: string, options: CatalogueStreamOptions): AsyncGenerator<CatalogueEntry> {
  const guess = formatFromName(path);
  if (guess.format === "parquet" && !guess.gzip) {
    yield* streamParquetCatalogue(path, options);
    return;
  }
  if (guess.format !== undefined && guess.format !== "text") {
    throw new InputError(`catalogue tables are read as delimited text (CSV, TSV) or Parquet; ${guess.extension} is not supported here`, { file: path });
  }
  let input: Readable = createReadStream(path);
  if (guess.gzip) input = input.pipe(createGunzip());
  const lines = createInterface({ input, crlfDelay: Number.POSITIVE_INFINITY });
  const iterator = lines[Symbol.asyncIterator]();
  const next = async (): Promise<IteratorResult<string>> => {
    try {
      return await iterator.next();
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      const reason = code === "ENOENT" ? "no such file" : code === "EISDIR" ? "it is a folder" : code === "Z_DATA_ERROR" ? "not valid gzip data" : (code ?? String(error));
      throw new InputError(`cannot read the catalogue (${reason})`, { file: path });
    }
  };

  try {
    // Scan the first lines for the layout, then replay them.
    const head: string[] = [];
    let done = false;
    while (head.length < LAYOUT_SCAN_LINES) {
      const step = await next();
      if (step.done) {
        done = true;
        break;
      }
      head.push(step.value.replace(/^\uFEFF/, ""));
    }
    const layout = requireDelimitedLayout(head, path, options.delimiter, guess.delimiter);
    const names = layoutColumnNames(layout);
    const idIndex = findColumn(names, options.idColumn, "object-id", path);
    const chosen = chooseColumns(names, options, path, layout.header !== null);
    for (const role of [chosen.time, chosen.value, chosen.error, chosen.band]) {
      if (role && role.index === idIndex) {
        throw new InputError("the object-id column is also chosen as a light-curve column", { file: path, column: names[idIndex] });
      }
    }

    const finished = new Set<string>();
    let group: ObjectRows | undefined;
    let lineNumber = 0;
    const handle = (line: string): CatalogueEntry | undefined => {
      lineNumber++;
      if (lineNumber - 1 <= layout.headerLineIndex || isSkippableLine(line)) return undefined;
      const fields = rowFields(line, lineNumber, layout, names, path);
      const id = fields[idIndex].trim();
      if (id === "") throw new InputError("no object id", { file: path, line: lineNumber, column: names[idIndex] });
      let completed: CatalogueEntry | undefined;
      if (!group || group.id !== id) {
        if (finished.has(id)) throw notContiguous(id, { file: path, line: lineNumber, column: names[idIndex] });
        if (group) {
          finished.add(group.id);
          completed = finishObject(group, path, "line", chosen, options);
        }
        group = newObjectRows(id, chosen);
      }
      if (group.problem === undefined) {
        try {
          group.positions.push(lineNumber);
          group.time.push(numericField(fields[chosen.time.index], lineNumber, chosen.time.name, path));
          group.value.push(numericField(fields[chosen.value.index], lineNumber, chosen.value.name, path));
          if (group.error) group.error.push(numericField(fields[chosen.error!.index], lineNumber, chosen.error!.name, path));
          if (group.band) group.band.push(bandField(fields[chosen.band!.index]));
        } catch (problem) {
          if (!(problem instanceof InputError)) throw problem;
          group.problem = problem.message;
        }
      }
      return completed;
    };

    for (const line of head) {
      const entry = handle(line);
      if (entry) yield entry;
    }
    while (!done) {
      const step = await next();
      if (step.done) break;
      const entry = handle(step.value);
      if (entry) yield entry;
    }
    if (group) yield finishObject(group, path, "line", chosen, options);
  } finally {
    lines.close();
    input.destroy();
  }
}
