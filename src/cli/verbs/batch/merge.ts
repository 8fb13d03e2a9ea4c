import { writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { openCatalogue } from "../../../batch/catalogue-input.js";
import { mergeResults, type MergeReport } from "../../../batch/merge-results.js";
import { UsageError } from "../../../errors/usage-error.js";
import type { CliIo } from "../../cli-io.js";
import { OUTPUT_OPTIONS, textOption, valueOptions, withParsedArguments } from "../../verb-arguments.js";
import { resultsFormatOf } from "./catalogue-fit-arguments.js";

const MERGE_HELP = `Usage: horologium batch merge SHARD_TABLE... --out RESULTS [--catalogue INPUT]

Joins the results tables of the shards of a run (CSV or Parquet) into one table (.csv or .parquet)
and reports: how many objects are ok and failed (listing the first failures with their reasons),
objects found in more than one shard (the first is kept), shards missing from the set (from the
journals beside the tables), and, with --catalogue, the objects of the catalogue that no shard
recorded. Refuses to join tables of different runs (another model, seed or input).
Exit status 0 when nothing is missing, 3 when shards or objects are missing.

Options:
  --out FILE              merged table, .csv or .parquet (required)
  --catalogue INPUT       the catalogue the shards were fitted from, to list missing objects
  --id-col NAME           its object-id column, when it is one table
  --missing-list FILE     write the ids of missing objects to FILE, one per line
  --quiet                 print nothing but problems
  -h, --help              this help

Example:
  horologium batch merge demo-drw-shards/shard-*.csv --catalogue demo --out demo-drw.csv
`;

const MERGE_OPTIONS = {
  ...OUTPUT_OPTIONS,
  ...valueOptions("catalogue", "id-col", "missing-list"),
};

/** `horologium batch merge`: joins the shard tables of a run and reports what is missing. */
export const merge = withParsedArguments(MERGE_OPTIONS, MERGE_HELP, async ({ values, positionals }, io: CliIo): Promise<number> => {
  if (positionals.length === 0) throw new UsageError("give the shard tables to merge");
  const outOption = textOption(values, "out");
  if (outOption === undefined) throw new UsageError("--out is required (a .csv or .parquet table)");
  const out = resolve(io.cwd, outOption);
  const inputs = positionals.map((input) => resolve(io.cwd, input));
  if (inputs.includes(out)) throw new UsageError(`--out ${outOption} is also one of the tables to merge`);
  const catalogueOption = textOption(values, "catalogue");
  const catalogue =
    catalogueOption === undefined
      ? undefined
      : await openCatalogue(resolve(io.cwd, catalogueOption), { idColumn: textOption(values, "id-col") });
  const missingList = textOption(values, "missing-list");
  if (missingList !== undefined && !catalogue) throw new UsageError("--missing-list needs --catalogue");
  const missingIds: string[] = [];
  const report = await mergeResults({
    inputs,
    out,
    format: resultsFormatOf(outOption, "--out"),
    catalogueIds: catalogue ? () => catalogue.ids() : undefined,
    onMissing: missingList !== undefined ? (id) => missingIds.push(id) : undefined,
  });
  if (missingList !== undefined) {
    writeFileSync(resolve(io.cwd, missingList), missingIds.map((id) => `${id}\n`).join(""));
  }
  const incomplete = report.missingShards.length > 0 || (report.missing ?? 0) > 0;
  if (!values.quiet || incomplete) io.stdout(describeMerge(report, outOption));
  return incomplete ? 3 : 0;
});

function describeMerge(report: MergeReport, outOption: string): string {
  const lines = [`merged ${report.inputs} table(s) into ${outOption}: ${report.rows} objects, ${report.ok} ok, ${report.failed} failed`];
  for (const failure of report.failureExamples) lines.push(`  failed ${failure.id}: ${failure.reason}`);
  if (report.failed > report.failureExamples.length) lines.push(`  ... and ${report.failed - report.failureExamples.length} more failed`);
  if (report.duplicates > 0) {
    lines.push(`${report.duplicates} object(s) in more than one table, first kept: ${report.duplicateExamples.join(", ")}`);
  }
  if (report.missingShards.length > 0) {
    lines.push(`missing shard(s) of ${report.shardCount}: ${report.missingShards.join(", ")}`);
  }
  if (report.missing !== undefined) {
    lines.push(
      report.missing === 0
        ? "every object of the catalogue is in the table"
        : `${report.missing} object(s) of the catalogue are in no table: ${report.missingExamples.join(", ")}${
            report.missing > report.missingExamples.length ? ", ..." : ""
          }`,
    );
  }
  return lines.join("\n") + "\n";
}

