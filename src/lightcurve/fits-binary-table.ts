import { InputError } from "../errors/input-error.js";

/**
 * A reader for binary-table extensions (XTENSION = 'BINTABLE') of FITS files, written from the FITS
 * Standard 4.0 (IAU FITS Working Group 2016): 2880-byte blocks (sect. 3.1), 80-character header cards
 * (sect. 4), the primary HDU (sect. 4.4.1.1) and the binary table (sect. 7.3). Pure: takes bytes, so
 * it also works in the browser. Scalar columns of types L, B, I, J, K, A, E and D are read, with
 * TSCALn/TZEROn scaling and TNULLn null values; vector, bit, complex and variable-length columns are
 * listed but not read.
 */

/** FITS logical record length in bytes (Standard 4.0, sect. 3.1). */
export const FITS_BLOCK = 2880;
/** Header card length (Standard 4.0, sect. 4.1.1). */
export const FITS_CARD = 80;

/** A header value: string, logical, or number (integers and reals alike). */
export type FitsValue = string | boolean | number | bigint;

/** One column of a binary table (Standard 4.0, sect. 7.3.1 and Table 18). */
export interface FitsColumn {
  /** TTYPEn, or the column number as text when absent. */
  readonly name: string;
  /** 1-based column number n. */
  readonly number: number;
  /** The TFORMn data type letter: L X B I J K A E D C M P Q. */
  readonly type: string;
  /** The repeat count r of TFORMn = rT. */
  readonly repeat: number;
  /** Byte offset of the field within a row. */
  readonly offset: number;
  /** Field width in bytes. */
  readonly width: number;
  readonly unit?: string;
  readonly scale: number;
  readonly zero: number;
  /** TNULLn for integer columns. */
  readonly nullValue?: number | bigint;
}

/** A binary-table extension located in a FITS file. */
export interface FitsBinaryTable {
  /** EXTNAME, if present. */
  readonly name?: string;
  /** 0-based HDU index (0 is the primary HDU). */
  readonly hduIndex: number;
  readonly columns: readonly FitsColumn[];
  readonly rowCount: number;
  /** NAXIS1: bytes per row. */
  readonly rowBytes: number;
  /** The main data table (NAXIS1 x NAXIS2 bytes). */
  readonly data: DataView;
  readonly header: ReadonlyMap<string, FitsValue>;
}

/** Element widths in bytes of the TFORM type letters (Standard 4.0, Table 18); X is in bits. */
const ELEMENT_BYTES: Readonly<Record<string, number>> = {
  L: 1, X: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, C: 8, M: 16, P: 8, Q: 16,
};

/**
 * Finds every binary-table extension in a FITS file, in file order. Throws an InputError naming the
 * file for anything that breaks the standard: no SIMPLE = T card, a header without END, a missing or
 * invalid mandatory keyword, an invalid TFORMn, a row width that disagrees with the columns, or data
 * cut short.
 */
export function parseFitsBinaryTables(bytes: Uint8Array, source: string): FitsBinaryTable[] {
  const fail = (problem: string, column?: string) => new InputError(problem, { file: source, column });
  if (bytes.length < FITS_BLOCK || ascii(bytes, 0, 9) !== "SIMPLE  =") {
    throw fail("not a FITS file (it does not start with a SIMPLE = T card)");
  }
  const tables: FitsBinaryTable[] = [];
  let position = 0;
  for (let hduIndex = 0; position < bytes.length; hduIndex++) {
    if (bytes.length - position < FITS_BLOCK) {
      // Standard 4.0 sect. 3.3.2: anything after the last HDU is not part of the file structure.
      break;
    }
    const { header, end } = readHeader(bytes, position, source, hduIndex);
    const number = (key: string, fallback?: number): number => {
      const value = header.get(key);
      if (value === undefined && fallback !== undefined) return fallback;
      if (typeof value !== "number" || !Number.isInteger(value) || value < 0) {
        throw fail(`HDU ${hduIndex}: keyword ${key} is ${value === undefined ? "missing" : `invalid (${String(value)})`}`);
      }
      return value;
    };
    if (hduIndex === 0 && header.get("SIMPLE") !== true) throw fail("not a standard FITS file (SIMPLE is not T)");
    const bitpix = header.get("BITPIX") as number;
    if (![8, 16, 32, 64, -32, -64].includes(bitpix)) {
      throw fail(`HDU ${hduIndex}: BITPIX = ${String(header.get("BITPIX"))} is not one of 8, 16, 32, 64, -32, -64`);
    }
    const naxis = number("NAXIS");
    let elements = naxis === 0 ? 0 : 1;
    const axes: number[] = [];
    for (let k = 1; k <= naxis; k++) {
      axes.push(number(`NAXIS${k}`));
      elements *= axes[k - 1];
    }
    const isExtension = hduIndex > 0;
    const pcount = isExtension ? number("PCOUNT", 0) : 0;
    const gcount = isExtension ? number("GCOUNT", 1) : 1;
    // Standard 4.0 eq. 2: Nbits = |BITPIX| x GCOUNT x (PCOUNT + NAXIS1 x ... x NAXISm).
    const dataBytes = naxis === 0 ? 0 : (Math.abs(bitpix) / 8) * gcount * (pcount + elements);
    const dataStart = end;
    if (dataStart + dataBytes > bytes.length) {
      throw fail(`HDU ${hduIndex}: the file ends inside the data (needs ${dataStart + dataBytes} bytes, has ${bytes.length})`);
    }
    if (isExtension && header.get("XTENSION") === "BINTABLE") {
      if (bitpix !== 8 || naxis !== 2) throw fail(`HDU ${hduIndex}: a BINTABLE needs BITPIX = 8 and NAXIS = 2`);
      const columns = readColumns(header, axes[0], hduIndex, fail);
      tables.push({
        name: typeof header.get("EXTNAME") === "string" ? (header.get("EXTNAME") as string) : undefined,
        hduIndex,
        columns,
        rowCount: axes[1],
        rowBytes: axes[0],
        data: new DataView(bytes.buffer, bytes.byteOffset + dataStart, axes[0] * axes[1]),
        header,
      });
    }
    position = dataStart + Math.ceil(dataBytes / FITS_BLOCK) * FITS_BLOCK;
  }
  return tables;
}

/**
 * Reads one scalar cell: a number (after TSCAL/TZERO), a string (A), a boolean (L), or null for a
 * null value (TNULLn, a NaN float, a blank logical). Throws an InputError with the row for a column
 * that cannot be read as a scalar.
 *
 * @param row 0-based row index
 */
export function readFitsCell(table: FitsBinaryTable, row: number, column: FitsColumn, source: string): number | string | boolean | null {
  if (column.type === "A") {
    let text = "";
    const base = row * table.rowBytes + column.offset;
    for (let k = 0; k < column.repeat; k++) {
      const code = table.data.getUint8(base + k);
      if (code === 0) break; // Standard 4.0 sect. 7.3.3.1: a NUL ends the string.
      text += String.fromCharCode(code);
    }
    return text.trimEnd();
  }
  if (column.repeat !== 1 || !["L", "B", "I", "J", "K", "E", "D"].includes(column.type)) {
    const what = column.repeat === 0 ? "holds no data (repeat count 0)" : column.repeat > 1 ? `holds vectors of ${column.repeat} elements` : `has type ${column.type}, which Horologium does not read`;
    throw new InputError(`column ${what}; choose a scalar numeric column`, { file: source, column: column.name });
  }
  const at = row * table.rowBytes + column.offset;
  const view = table.data;
  switch (column.type) {
    case "L": {
      const code = view.getUint8(at);
      return code === 0x54 ? true : code === 0x46 ? false : null;
    }
    case "B":
      return scaled(view.getUint8(at), column);
    case "I":
      return scaled(view.getInt16(at, false), column);
    case "J":
      return scaled(view.getInt32(at, false), column);
    case "K": {
      const raw = view.getBigInt64(at, false);
      if (column.nullValue !== undefined && BigInt(column.nullValue) === raw) return null;
      return column.zero + column.scale * Number(raw);
    }
    case "E":
      return column.zero + column.scale * view.getFloat32(at, false);
    default:
      return column.zero + column.scale * view.getFloat64(at, false);
  }
}

function scaled(raw: number, column: FitsColumn): number | null {
  if (column.nullValue !== undefined && Number(column.nullValue) === raw) return null;
  return column.zero + column.scale * raw;
}

function readColumns(
  header: ReadonlyMap<string, FitsValue>,
  rowBytes: number,
  hduIndex: number,
  fail: (problem: string, column?: string) => InputError,
): FitsColumn[] {
  const count = header.get("TFIELDS");
  if (typeof count !== "number" || !Number.isInteger(count) || count < 0 || count > 999) {
    throw fail(`HDU ${hduIndex}: keyword TFIELDS is ${count === undefined ? "missing" : `invalid (${String(count)})`}`);
  }
  const columns: FitsColumn[] = [];
  let offset = 0;
  for (let n = 1; n <= count; n++) {
    const ttype = header.get(`TTYPE${n}`);
    const name = typeof ttype === "string" && ttype.trim() !== "" ? ttype.trim() : String(n);
    const tform = header.get(`TFORM${n}`);
    if (typeof tform !== "string") throw fail(`HDU ${hduIndex}: keyword TFORM${n} is missing`, name);
    // Standard 4.0 sect. 7.3.1: TFORMn = 'rTa', r an optional repeat count, T the type, a extra characters.
    const match = /^\s*(\d*)([LXBIJKAEDCMPQ])(.*)$/.exec(tform);
    if (!match) throw fail(`HDU ${hduIndex}: TFORM${n} = '${tform}' is not a valid binary-table format`, name);
    const repeat = match[1] === "" ? 1 : Number(match[1]);
    const type = match[2];
    const width = type === "X" ? Math.ceil(repeat / 8) : type === "P" || type === "Q" ? (repeat > 0 ? ELEMENT_BYTES[type] : 0) : repeat * ELEMENT_BYTES[type];
    const numberOr = (key: string, fallback: number) => {
      const value = header.get(key);
      return typeof value === "number" ? value : fallback;
    };
    const tnull = header.get(`TNULL${n}`);
    const unit = header.get(`TUNIT${n}`);
    columns.push({
      name,
      number: n,
      type,
      repeat,
      offset,
      width,
      unit: typeof unit === "string" && unit.trim() !== "" ? unit.trim() : undefined,
      scale: numberOr(`TSCAL${n}`, 1),
      zero: numberOr(`TZERO${n}`, 0),
      nullValue: typeof tnull === "number" || typeof tnull === "bigint" ? tnull : undefined,
    });
    offset += width;
  }
  if (offset !== rowBytes) {
    throw fail(`HDU ${hduIndex}: the columns take ${offset} bytes per row but NAXIS1 = ${rowBytes}`);
  }
  return columns;
}

/** Reads header cards from `start` up to END; returns the keyword values and the offset of the data. */
function readHeader(
  bytes: Uint8Array,
  start: number,
  source: string,
  hduIndex: number,
): { header: Map<string, FitsValue>; end: number } {
  const header = new Map<string, FitsValue>();
  for (let at = start; at + FITS_CARD <= bytes.length; at += FITS_CARD) {
    const card = ascii(bytes, at, FITS_CARD);
    const keyword = card.slice(0, 8).trimEnd();
    if (keyword === "END") {
      const end = start + Math.ceil((at + FITS_CARD - start) / FITS_BLOCK) * FITS_BLOCK;
      return { header, end };
    }
    // Standard 4.0 sect. 4.1.2.2: a value indicator "= " in bytes 9-10 means the card has a value.
    if (keyword === "" || card.slice(8, 10) !== "= ") continue;
    if (!header.has(keyword)) header.set(keyword, parseCardValue(card.slice(10), keyword, source, hduIndex));
  }
  throw new InputError(`HDU ${hduIndex}: the header has no END card (truncated or not FITS)`, { file: source });
}

/**
 * The value field of a card (Standard 4.0, sect. 4.2): a quoted string with '' for a quote and
 * trailing blanks not significant, T or F, an integer, or a real (E or D exponent); "/" starts a comment.
 */
function parseCardValue(field: string, keyword: string, source: string, hduIndex: number): FitsValue {
  const text = field.trimStart();
  if (text.startsWith("'")) {
    let value = "";
    for (let i = 1; i < text.length; i++) {
      if (text[i] === "'") {
        if (text[i + 1] === "'") {
          value += "'";
          i++;
        } else return value.trimEnd();
      } else value += text[i];
    }
    throw new InputError(`HDU ${hduIndex}: keyword ${keyword} has an unterminated string`, { file: source });
  }
  const slash = text.indexOf("/");
  const token = (slash >= 0 ? text.slice(0, slash) : text).trim();
  if (token === "T") return true;
  if (token === "F") return false;
  if (/^[+-]?\d+$/.test(token)) {
    const big = BigInt(token);
    return big >= BigInt(Number.MIN_SAFE_INTEGER) && big <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(big) : big;
  }
  if (/^[+-]?(\d+\.?\d*|\.\d+)([EeDd][+-]?\d+)?$/.test(token)) return Number(token.replace(/[Dd]/, "e"));
  // Complex values and undefined values are legal but not needed here.
  return token;
}

function ascii(bytes: Uint8Array, start: number, length: number): string {
  let text = "";
  for (let i = start; i < start + length && i < bytes.length; i++) text += String.fromCharCode(bytes[i]);
  return text;
}
