import { looksNumeric } from "./numeric-cell.js";

/**
 * The layout of a delimited text table (CSV, TSV, whitespace-aligned columns): delimiter, comment
 * lines and header, detected from its first lines. Pure string functions, usable in the browser.
 */

/** A field separator; "whitespace" means runs of spaces and tabs, as in fixed-width .dat files. */
export type Delimiter = "," | "\t" | ";" | "|" | "whitespace";

/** Characters that start a comment line (after leading blanks). */
export const COMMENT_PREFIXES: readonly string[] = ["#", "%"];

/** How a delimited table is laid out. */
export interface DelimitedLayout {
  readonly delimiter: Delimiter;
  /** Column names, or null for a headerless table. */
  readonly header: string[] | null;
  /** 0-based index among the scanned lines of the header line (possibly a comment line), or -1. */
  readonly headerLineIndex: number;
  /** Number of fields in a data row. */
  readonly fieldCount: number;
}

/** Whether a line carries no data: blank, or a comment. */
export function isSkippableLine(line: string): boolean {
  const trimmed = line.trim();
  return trimmed === "" || COMMENT_PREFIXES.some((p) => trimmed.startsWith(p));
}

/**
 * Splits one line into fields. Single-character delimiters honour double quotes ("a,b" is one field,
 * "" inside quotes is a quote), as in RFC 4180; fields are trimmed. Quoted fields may not span lines.
 */
export function splitFields(line: string, delimiter: Delimiter): string[] {
  if (delimiter === "whitespace") {
    const trimmed = line.trim();
    return trimmed === "" ? [] : trimmed.split(/[ \t]+/);
  }
  if (!line.includes('"')) return line.split(delimiter).map((f) => f.trim());
  const fields: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"') {
        if (line[i + 1] === '"') {
          field += '"';
          i++;
        } else quoted = false;
      } else field += c;
    } else if (c === '"' && field.trim() === "") {
      quoted = true;
      field = "";
    } else if (c === delimiter) {
      fields.push(field.trim());
      field = "";
    } else field += c;
  }
  fields.push(field.trim());
  return fields;
}

/**
 * Detects the layout from the first lines of a table (pass a few dozen). The delimiter is the one that
 * splits every data line into the same number (> 1) of fields, trying the extension's own first
 * (".csv": comma, ".tsv": tab), then tab, comma, semicolon, bar and whitespace. The first data line is
 * a header when none of its fields is a number; failing that, a comment line just above the data whose
 * fields match the data in number and are not numbers (such as "# mjd mag err") is taken as the header.
 *
 * @returns the layout, or null when no delimiter gives at least two consistent columns
 */
export function detectDelimitedLayout(lines: readonly string[], preferred?: Delimiter): DelimitedLayout | null {
  const dataIndices: number[] = [];
  for (let i = 0; i < lines.length && dataIndices.length < 25; i++) if (!isSkippableLine(lines[i])) dataIndices.push(i);
  if (dataIndices.length === 0) return null;
  const order: Delimiter[] = ["\t", ",", ";", "|", "whitespace"];
  const candidates = preferred ? [preferred, ...order.filter((d) => d !== preferred)] : order;

  for (const delimiter of candidates) {
    const counts = dataIndices.map((i) => splitFields(lines[i], delimiter).length);
    // The first line may be a header with the same count; a ragged table is judged on most lines.
    const fieldCount = mode(counts.length > 1 ? counts.slice(1) : counts);
    if (fieldCount < 2) continue;
    const agreeing = counts.filter((c) => c === fieldCount).length;
    if (agreeing < Math.max(1, Math.ceil(0.8 * counts.length))) continue;

    const first = splitFields(lines[dataIndices[0]], delimiter);
    if (first.every((f) => f === "" || !looksNumeric(f)) && first.some((f) => f !== "")) {
      return { delimiter, header: first.map(unquote), headerLineIndex: dataIndices[0], fieldCount };
    }
    const above = dataIndices[0] - 1;
    if (above >= 0 && lines[above].trim() !== "") {
      const body = lines[above].trim().replace(/^[#%]+/, "");
      for (const d of [delimiter, "whitespace"] as Delimiter[]) {
        const names = splitFields(body, d).filter((f, k, all) => !(f === "" && (k === 0 || k === all.length - 1)));
        if (names.length === fieldCount && names.every((f) => f !== "" && !looksNumeric(f))) {
          return { delimiter, header: names.map(unquote), headerLineIndex: above, fieldCount };
        }
      }
    }
    return { delimiter, header: null, headerLineIndex: -1, fieldCount };
  }
  return null;
}

/** The delimiter a file extension implies, if any. */
export function delimiterForExtension(extension: string): Delimiter | undefined {
  const lower = extension.toLowerCase();
  if (lower === ".csv") return ",";
  if (lower === ".tsv" || lower === ".tab") return "\t";
  return undefined;
}

/** Names a delimiter for messages. */
export function describeDelimiter(delimiter: Delimiter): string {
  return { ",": "comma", "\t": "tab", ";": "semicolon", "|": "bar", whitespace: "whitespace" }[delimiter];
}

function unquote(field: string): string {
  return field.replace(/^"(.*)"$/, "$1").trim();
}

function mode(values: number[]): number {
  const counts = new Map<number, number>();
  let best = values[0];
  for (const v of values) {
    const c = (counts.get(v) ?? 0) + 1;
    counts.set(v, c);
    if (c > (counts.get(best) ?? 0)) best = v;
  }
  return best;
}
