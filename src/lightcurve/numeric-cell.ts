/**
 * Reading one table cell as a number, with the distinctions the readers need: a number, a missing
 * value (dropped and counted), or garbage and infinities (rejected with file, line and column).
 */

/** What a cell holds once read. */
export type NumericCell =
  | { readonly kind: "number"; readonly value: number }
  | { readonly kind: "missing" }
  | { readonly kind: "infinite" }
  | { readonly kind: "garbage" };

/** Spellings of a missing value in text tables (case-insensitive): empty, NaN, null, NA, N/A, None. */
export const MISSING_TOKENS: ReadonlySet<string> = new Set(["", "nan", "null", "na", "n/a", "none"]);

// A plain decimal with optional exponent; "D" exponents appear in Fortran-written tables (common practice).
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?$/;
const INFINITY = /^[+-]?(?:inf|infinity)$/i;

/**
 * Classifies a text cell. Hexadecimal, binary and other forms that `Number()` accepts are garbage
 * here: a table of observations holds decimals. Values that overflow double precision are infinite.
 *
 * @example readNumericCell(" 2.5e1 ") // { kind: "number", value: 25 }
 */
export function readNumericCell(text: string): NumericCell {
  const trimmed = text.trim();
  if (MISSING_TOKENS.has(trimmed.toLowerCase())) return { kind: "missing" };
  if (INFINITY.test(trimmed)) return { kind: "infinite" };
  if (!DECIMAL.test(trimmed)) return { kind: "garbage" };
  const value = Number(trimmed.replace(/[dD]/, "e"));
  if (!Number.isFinite(value)) return { kind: "infinite" };
  return { kind: "number", value };
}

/** Whether a header cell looks like data: a number, so that the line is data rather than column names. */
export function looksNumeric(text: string): boolean {
  const kind = readNumericCell(text).kind;
  return kind === "number" || kind === "infinite";
}
