import { assembleLightCurves, type LightCurveSet, type ObservationColumns } from "./assemble-light-curves.js";
import { chooseColumns, type ColumnChoice } from "./column-choice.js";
import type { DelimitedReadOptions } from "./delimited-light-curve.js";
import { parseFitsBinaryTables, readFitsCell, type FitsBinaryTable, type FitsColumn } from "./fits-binary-table.js";
import { InputError } from "../errors/input-error.js";
import type { PhotometricUnit } from "./light-curve.js";
import { readNumericCell } from "./numeric-cell.js";

/**
 * Light curves from a FITS file: the first binary-table extension whose columns can be matched (as for
 * text tables) is read. Problems are reported by 1-based table row.
 */
export function parseFitsLightCurves(bytes: Uint8Array, source: string, options: DelimitedReadOptions = {}): LightCurveSet {
  const tables = parseFitsBinaryTables(bytes, source);
  if (tables.length === 0) throw new InputError("the FITS file has no binary-table extension (BINTABLE)", { file: source });
  let firstProblem: unknown;
  for (const table of tables) {
    const names = table.columns.map((c) => c.name);
    let choice: ColumnChoice;
    try {
      choice = chooseColumns(names, { ...options, unit: options.unit ?? unitOfColumns(table, options) }, source);
    } catch (problem) {
      firstProblem ??= problem;
      continue;
    }
    return assembleLightCurves(extractFitsColumns(table, choice, source), options);
  }
  throw firstProblem;
}

/** The photometric unit a TUNITn states for the value column, when it is clear. */
function unitOfColumns(table: FitsBinaryTable, options: DelimitedReadOptions): PhotometricUnit | undefined {
  let column: FitsColumn | undefined;
  try {
    const choice = chooseColumns(table.columns.map((c) => c.name), { ...options, unit: "mag" }, "");
    column = table.columns[choice.value.index];
  } catch {
    return undefined;
  }
  const unit = column.unit?.toLowerCase();
  if (unit === undefined) return undefined;
  if (unit === "mag" || unit.startsWith("mag(") || unit === "mag_ab") return "mag";
  // Flux densities, count rates and photo-electron rates (FITS Standard 4.0, Table 26 units and common practice).
  if (/jy|flux|erg|w\/m|e-\/s|electron|ct\/s|count|adu/.test(unit)) return "flux";
  return undefined;
}

function extractFitsColumns(table: FitsBinaryTable, choice: ColumnChoice, source: string): ObservationColumns {
  const n = table.rowCount;
  const numeric = (index: number) => {
    const column = table.columns[index];
    const out = new Float64Array(n);
    for (let row = 0; row < n; row++) {
      const cell = readFitsCell(table, row, column, source);
      if (cell === null) out[row] = Number.NaN;
      else if (typeof cell === "number") {
        if (Number.isNaN(cell)) out[row] = Number.NaN;
        else if (!Number.isFinite(cell)) throw new InputError(`${cell} is infinite`, { file: source, row: row + 1, column: column.name });
        else out[row] = cell;
      } else if (typeof cell === "string") {
        const parsed = readNumericCell(cell);
        if (parsed.kind === "number") out[row] = parsed.value;
        else if (parsed.kind === "missing") out[row] = Number.NaN;
        else {
          const problem = parsed.kind === "infinite" ? "is infinite" : "is not a number";
          throw new InputError(`${JSON.stringify(cell)} ${problem}`, { file: source, row: row + 1, column: column.name });
        }
      } else {
        throw new InputError(`a logical where a number is needed`, { file: source, row: row + 1, column: column.name });
      }
    }
    return out;
  };
  const band = choice.band
    ? Array.from({ length: n }, (_, row) => {
        const cell = readFitsCell(table, row, table.columns[choice.band!.index], source);
        return cell === null || String(cell).trim() === "" ? null : String(cell).trim();
      })
    : null;
  return {
    source,
    positionKind: "row",
    positions: Array.from({ length: n }, (_, i) => i + 1),
    time: numeric(choice.time.index),
    value: numeric(choice.value.index),
    error: choice.error ? numeric(choice.error.index) : null,
    band,
    choice,
  };
}
