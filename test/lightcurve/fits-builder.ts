/**
 * Writes small FITS files byte by byte from the FITS Standard 4.0 (IAU FITS Working Group 2016), for
 * tests: 80-character cards in fixed format (sect. 4.2: strings from column 11, numbers and logicals
 * right-justified to column 30), headers and data padded to 2880-byte blocks (sect. 3.1; headers with
 * blanks, binary data with zero bytes), big-endian binary-table rows (sect. 7.3).
 */

export type CardValue = string | number | boolean | bigint;

/** One 80-character header card. */
export function card(keyword: string, value?: CardValue, comment?: string): string {
  let text = keyword.padEnd(8);
  if (value !== undefined) {
    let field: string;
    if (typeof value === "string") field = `'${value.replace(/'/g, "''").padEnd(8)}'`.padEnd(20);
    else if (typeof value === "boolean") field = (value ? "T" : "F").padStart(20);
    else field = String(value).padStart(20);
    text += "= " + field;
    if (comment) text += " / " + comment;
  }
  if (text.length > 80) throw new Error(`card too long: ${text}`);
  return text.padEnd(80);
}

/** A header: the cards, END, and blank padding to a whole number of 2880-byte blocks. */
export function headerBytes(cards: string[], withEnd = true): Uint8Array {
  let text = cards.join("") + (withEnd ? card("END") : "");
  text = text.padEnd(Math.ceil(text.length / 2880) * 2880);
  return Uint8Array.from(text, (c) => c.charCodeAt(0));
}

/** Zero-padded data bytes. */
export function padData(data: Uint8Array): Uint8Array {
  const out = new Uint8Array(Math.ceil(data.length / 2880) * 2880);
  out.set(data);
  return out;
}

export function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

/** A primary HDU without data (NAXIS = 0), or with a small 8-bit image when `imageBytes` > 0. */
export function primaryHdu(imageBytes = 0): Uint8Array {
  const cards = [card("SIMPLE", true, "conforms to FITS standard"), card("BITPIX", 8)];
  if (imageBytes > 0) cards.push(card("NAXIS", 1), card("NAXIS1", imageBytes));
  else cards.push(card("NAXIS", 0));
  cards.push(card("EXTEND", true));
  const parts = [headerBytes(cards)];
  if (imageBytes > 0) parts.push(padData(Uint8Array.from({ length: imageBytes }, (_, i) => i % 251)));
  return concat(parts);
}

/** A binary-table column for {@link bintableHdu}. */
export interface ColumnSpec {
  readonly name?: string;
  /** TFORM, for example "D", "E", "J", "I", "K", "B", "L", "8A", "3D", "1PD(4)". */
  readonly form: string;
  readonly unit?: string;
  readonly tnull?: number;
  readonly tscal?: number;
  readonly tzero?: number;
  /** Stored (raw) values per row: numbers, bigints (K), strings (A), booleans (L), number arrays (vectors). */
  readonly values: readonly (number | bigint | string | boolean | readonly number[])[];
}

const WIDTH: Record<string, number> = { L: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, P: 8 };

/** A BINTABLE extension HDU with the given columns (all of equal length). */
export function bintableHdu(columns: ColumnSpec[], options: { extname?: string; naxis1Override?: number; omit?: string[] } = {}): Uint8Array {
  const parsed = columns.map((c) => {
    const m = /^(\d*)([A-Z])/.exec(c.form)!;
    const repeat = m[1] === "" ? 1 : Number(m[1]);
    return { ...c, repeat, type: m[2], width: repeat * (WIDTH[m[2]] ?? 0) };
  });
  const rowBytes = parsed.reduce((n, c) => n + c.width, 0);
  const rows = columns[0].values.length;
  const cards = [
    card("XTENSION", "BINTABLE", "binary table extension"),
    card("BITPIX", 8),
    card("NAXIS", 2),
    card("NAXIS1", options.naxis1Override ?? rowBytes),
    card("NAXIS2", rows),
    card("PCOUNT", 0),
    card("GCOUNT", 1),
    card("TFIELDS", columns.length),
  ];
  parsed.forEach((c, k) => {
    const n = k + 1;
    if (c.name !== undefined) cards.push(card(`TTYPE${n}`, c.name));
    cards.push(card(`TFORM${n}`, c.form));
    if (c.unit) cards.push(card(`TUNIT${n}`, c.unit));
    if (c.tnull !== undefined) cards.push(card(`TNULL${n}`, c.tnull));
    if (c.tscal !== undefined) cards.push(card(`TSCAL${n}`, c.tscal));
    if (c.tzero !== undefined) cards.push(card(`TZERO${n}`, c.tzero));
  });
  if (options.extname) cards.push(card("EXTNAME", options.extname));
  const kept = cards.filter((c) => !(options.omit ?? []).includes(c.slice(0, 8).trim()));
  const data = new Uint8Array(rowBytes * rows);
  const view = new DataView(data.buffer);
  for (let r = 0; r < rows; r++) {
    let at = r * rowBytes;
    for (const c of parsed) {
      const v = c.values[r];
      const elements = Array.isArray(v) ? v : [v];
      for (let e = 0; c.width > 0 && e < (c.type === "A" ? 1 : c.repeat); e++) {
        const x = elements[e] ?? 0;
        const p = at + e * WIDTH[c.type];
        switch (c.type) {
          case "A": {
            const s = String(x);
            for (let i = 0; i < c.repeat; i++) view.setUint8(at + i, i < s.length ? s.charCodeAt(i) : 0x20);
            break;
          }
          case "L": view.setUint8(p, x === true ? 0x54 : x === false ? 0x46 : 0); break;
          case "B": view.setUint8(p, Number(x)); break;
          case "I": view.setInt16(p, Number(x), false); break;
          case "J": view.setInt32(p, Number(x), false); break;
          case "K": view.setBigInt64(p, BigInt(x as number | bigint), false); break;
          case "E": view.setFloat32(p, Number(x), false); break;
          case "D": view.setFloat64(p, Number(x), false); break;
          case "P": view.setInt32(p, 0, false); view.setInt32(p + 4, 0, false); break;
        }
      }
      at += c.width;
    }
  }
  return concat([headerBytes(kept), padData(data)]);
}
