#!/usr/bin/env node
// Compares two results tables of `horologium batch` (CSV or Parquet) as sets of rows keyed by
// object_id: same objects, same columns, same cells (NaN equals NaN), in any row order. Columns
// given with --ignore (for example the wall-clock diagnostics.seconds) are left out. Exit 0 when
// equal, 1 with the first differences when not. Reads the tables with the compiled results reader,
// so run `npm run build` first.
// Usage: node scripts/compare-result-tables.mjs A.csv B.csv [--ignore COLUMN]...
import { parseArgs } from "node:util";

const { readResultsTable } = await import(new URL("../dist/src/batch/results-table-reader.js", import.meta.url).href);
const { values, positionals } = parseArgs({ options: { ignore: { type: "string", multiple: true } }, allowPositionals: true });
if (positionals.length !== 2) {
  console.error("usage: node scripts/compare-result-tables.mjs A B [--ignore COLUMN]...");
  process.exit(2);
}
const ignored = new Set(values.ignore ?? []);

async function load(path) {
  const rows = new Map();
  const columns = new Set();
  for await (const row of readResultsTable(path)) {
    if (rows.has(row.object_id)) throw new Error(`${path}: object ${row.object_id} appears twice`);
    rows.set(row.object_id, row);
    for (const column of Object.keys(row)) if (!ignored.has(column)) columns.add(column);
  }
  return { rows, columns };
}

const [a, b] = await Promise.all(positionals.map(load));
const differences = [];
const same = (x, y) => Object.is(x, y) || (x === y) || (Number.isNaN(x) && Number.isNaN(y));
for (const column of new Set([...a.columns, ...b.columns])) {
  if (!a.columns.has(column)) differences.push(`column ${column} only in ${positionals[1]}`);
  else if (!b.columns.has(column)) differences.push(`column ${column} only in ${positionals[0]}`);
}
for (const id of new Set([...a.rows.keys(), ...b.rows.keys()])) {
  const x = a.rows.get(id);
  const y = b.rows.get(id);
  if (!x || !y) {
    differences.push(`object ${id} only in ${x ? positionals[0] : positionals[1]}`);
    continue;
  }
  for (const column of a.columns) {
    if (b.columns.has(column) && !same(x[column] ?? null, y[column] ?? null)) {
      differences.push(`object ${id}, ${column}: ${JSON.stringify(x[column])} vs ${JSON.stringify(y[column])}`);
    }
  }
}
if (differences.length > 0) {
  console.error(`${positionals[0]} and ${positionals[1]} differ in ${differences.length} place(s):`);
  for (const line of differences.slice(0, 20)) console.error(`  ${line}`);
  process.exit(1);
}
console.log(`${positionals[0]} and ${positionals[1]} are equal: ${a.rows.size} objects, ${a.columns.size} columns compared` +
  (ignored.size ? ` (ignoring ${[...ignored].join(", ")})` : ""));
