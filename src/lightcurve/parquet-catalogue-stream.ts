import { asyncBufferFromFile, parquetMetadataAsync, parquetReadObjects, parquetSchema, type AsyncBuffer, type FileMetaData } from "hyparquet";
import { finishObject, newObjectRows, notContiguous, type CatalogueEntry, type ObjectRows } from "./catalogue-object-rows.js";
import { chooseColumns, findColumn } from "./column-choice.js";
import type { DelimitedReadOptions } from "./delimited-light-curve.js";
import { InputError } from "../errors/input-error.js";
import { numericParquetCell, UNIX_EPOCH_MJD } from "./parquet-light-curve.js";

/**
 * Streams a Parquet catalogue (one row per observation, an object-id column) one object at a time,
 * decoding one row group at a time with `hyparquet`, so memory holds a row group and one object whatever
 * the file size. Columns are chosen as for single light curves; rows of an object must be contiguous;
 * problems are reported by 1-based table row. Timestamps in the time column become MJD (UTC).
 *
 * @example for await (const { id, lightCurve } of streamParquetCatalogue("survey.parquet", { idColumn: "objid" })) ...
 */
export async function* streamParquetCatalogue(
  path: string,
  options: DelimitedReadOptions & { readonly idColumn: string },
): AsyncGenerator<CatalogueEntry> {
  let file: AsyncBuffer;
  let metadata: FileMetaData;
  try {
    file = await asyncBufferFromFile(path);
    metadata = await parquetMetadataAsync(file);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason = code === "ENOENT" ? "no such file" : error instanceof Error ? error.message : String(error);
    throw new InputError(`not a readable Parquet file (${reason})`, { file: path });
  }
  const names = parquetSchema(metadata)
    .children.filter((child) => child.children.length === 0)
    .map((child) => child.element.name);
  const idIndex = findColumn(names, options.idColumn, "object-id", path);
  const idName = names[idIndex];
  const chosen = chooseColumns(names, options, path);
  for (const role of [chosen.time, chosen.value, chosen.error, chosen.band]) {
    if (role && role.index === idIndex) throw new InputError("the object-id column is also chosen as a light-curve column", { file: path, column: idName });
  }
  const wanted = [idName, chosen.time.name, chosen.value.name];
  if (chosen.error) wanted.push(chosen.error.name);
  if (chosen.band) wanted.push(chosen.band.name);

  const finished = new Set<string>();
  let group: ObjectRows | undefined;
  let convertedTimestamps = false;
  const finish = (rows: ObjectRows): CatalogueEntry => {
    const entry = finishObject(rows, path, "row", chosen, options);
    if (!convertedTimestamps || entry.problem !== undefined) return entry;
    convertedTimestamps = false;
    return { ...entry, warnings: [...entry.warnings, `object "${rows.id}": timestamps in column "${chosen.time.name}" were converted to MJD (UTC)`] };
  };
  let rowStart = 0;
  for (const rowGroup of metadata.row_groups) {
    const rowEnd = rowStart + Number(rowGroup.num_rows);
    let rows: Record<string, unknown>[];
    try {
      rows = await parquetReadObjects({ file, metadata, columns: wanted, rowStart, rowEnd });
    } catch (error) {
      throw new InputError(`cannot decode the Parquet data (${error instanceof Error ? error.message : String(error)})`, { file: path, row: rowStart + 1 });
    }
    for (let i = 0; i < rows.length; i++) {
      const row = rowStart + i + 1;
      const cells = rows[i];
      const idCell = cells[idName];
      const id = idCell === null || idCell === undefined ? "" : String(idCell).trim();
      if (id === "") throw new InputError("no object id", { file: path, row, column: idName });
      if (!group || group.id !== id) {
        if (finished.has(id)) throw notContiguous(id, { file: path, row, column: idName });
        if (group) {
          finished.add(group.id);
          yield finish(group);
        }
        group = newObjectRows(id, chosen);
        convertedTimestamps = false;
      }
      if (group.problem !== undefined) continue;
      try {
        const timeCell = cells[chosen.time.name];
        if (timeCell instanceof Date) convertedTimestamps = true;
        group.positions.push(row);
        group.time.push(timeCell instanceof Date ? timeCell.getTime() / 86_400_000 + UNIX_EPOCH_MJD : numericParquetCell(timeCell, path, row, chosen.time.name));
        group.value.push(numericParquetCell(cells[chosen.value.name], path, row, chosen.value.name));
        if (group.error) group.error.push(numericParquetCell(cells[chosen.error!.name], path, row, chosen.error!.name));
        if (group.band) {
          const band = cells[chosen.band!.name];
          group.band.push(band === null || band === undefined || String(band).trim() === "" ? null : String(band).trim());
        }
      } catch (problem) {
        if (!(problem instanceof InputError)) throw problem;
        group.problem = problem.message;
      }
    }
    rowStart = rowEnd;
  }
  if (group) yield finish(group);
}
