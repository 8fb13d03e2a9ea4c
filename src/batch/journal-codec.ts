import type { ResultCell, ResultRow } from "./result-row.js";

/**
 * JSON cannot hold NaN or the infinities, which a diagnostic such as R-hat may legitimately be; they are
 * written as `{"nonFinite": "NaN" | "Infinity" | "-Infinity"}` and read back as numbers, so a row makes
 * the round trip through the journal exactly (finite doubles already do, JSON numbers being shortest
 * round-trip decimals).
 */
export function encodeJournalRow(row: ResultRow): string {
  return JSON.stringify(row, (_key, value: unknown) =>
    typeof value === "number" && !Number.isFinite(value) ? { nonFinite: String(value) } : value,
  );
}

/** Reads a row written by {@link encodeJournalRow}; throws a SyntaxError or TypeError when it is not one. */
export function decodeJournalRow(text: string): ResultRow {
  const parsed: unknown = JSON.parse(text, (_key, value: unknown) => {
    if (value !== null && typeof value === "object" && !Array.isArray(value)) {
      const keys = Object.keys(value);
      const tag = (value as Record<string, unknown>).nonFinite;
      if (keys.length === 1 && typeof tag === "string") return Number(tag);
    }
    return value;
  });
  if (parsed === null || typeof parsed !== "object" || Array.isArray(parsed)) throw new TypeError("not a JSON object");
  for (const value of Object.values(parsed)) {
    if (value !== null && typeof value === "object") throw new TypeError("a cell is not a scalar");
  }
  const row = parsed as Record<string, ResultCell>;
  if (typeof row.object_id !== "string" || (row.status !== "ok" && row.status !== "failed")) {
    throw new TypeError("object_id or status is missing");
  }
  return row;
}
