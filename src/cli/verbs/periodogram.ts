import { computePeriodogram } from "../../periodogram/periodogram.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";
import { readInput } from "../read-input.js";
import { COLUMN_HELP, COLUMN_OPTIONS, numberOption, parseVerbArguments, singleInput, textOption } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";

const HELP = `Usage: horologium periodogram FILE [options]

Computes the generalised Lomb-Scargle periodogram (Zechmeister & Kurster 2009, A&A 496, 577:
weights from the errors, a floating mean) on an automatic frequency grid (VanderPlas 2018, ApJS
236, 16), and lists the strongest peaks with the search-wide false-alarm probability of Baluev
2008 (MNRAS 385, 1279).

Options:
  --min-period P          shortest period searched (default: twice the typical spacing of visits on
                          different nights, not of visits clustered minutes apart)
  --max-period P          longest period searched (default: the baseline)
  --oversampling K        grid points per peak width (default 5)
  --peaks N               peaks to list (default 5)
  --out FILE              write the periodogram as CSV (frequency,period,power) here
  --quiet                 do not print the peak table
${COLUMN_HELP}

Example:
  horologium periodogram demo/lds-v2291-spotted-star.csv --max-period 60 --out power.csv
`;

const OPTIONS = {
  ...COLUMN_OPTIONS,
  "min-period": { type: "string" },
  "max-period": { type: "string" },
  oversampling: { type: "string" },
  peaks: { type: "string" },
  out: { type: "string" },
  quiet: { type: "boolean" },
} as const;

/** `horologium periodogram`. */
export const verb: CliVerb = {
  summary: "generalised Lomb-Scargle periodogram with false-alarm probabilities",
  async run(args: string[], io: CliIo): Promise<number> {
    const parsed = parseVerbArguments(args, OPTIONS, HELP, io.stdout);
    if (!parsed) return 0;
    const { values, positionals } = parsed;
    const file = singleInput(positionals);
    const quiet = values.quiet === true;
    const minPeriod = numberOption(values, "min-period");
    const maxPeriod = numberOption(values, "max-period");
    const oversampling = numberOption(values, "oversampling");
    const peaks = numberOption(values, "peaks", 5)!;
    for (const [name, value] of [["min-period", minPeriod], ["max-period", maxPeriod], ["oversampling", oversampling]] as const)
      if (value !== undefined && !(value > 0)) throw new UsageError(`--${name} must be > 0, got ${value}`);
    if (!Number.isInteger(peaks) || peaks < 1) throw new UsageError(`--peaks must be a positive integer, got ${peaks}`);
    if (minPeriod !== undefined && maxPeriod !== undefined && !(minPeriod < maxPeriod))
      throw new UsageError(`--min-period (${minPeriod}) must be below --max-period (${maxPeriod})`);
    const lightCurves = await readInput(file, values, io, quiet);
    const csv: string[] = [];
    for (const lightCurve of lightCurves) {
      const periodogram = computePeriodogram(
        { time: lightCurve.time, value: lightCurve.value, ...(lightCurve.error ? { error: lightCurve.error } : {}) },
        {
          ...(maxPeriod !== undefined ? { minimumFrequency: 1 / maxPeriod } : {}),
          ...(minPeriod !== undefined ? { maximumFrequency: 1 / minPeriod } : {}),
          ...(oversampling !== undefined ? { oversampling } : {}),
          peaks,
        },
      );
      if (!quiet) {
        io.stdout(`${file}${lightCurve.band ? ` [band ${lightCurve.band}]` : ""}: ${periodogram.n} points, ${periodogram.frequency.length} frequencies\n`);
        io.stdout(`  ${"period".padStart(12)} ${"frequency".padStart(12)} ${"power".padStart(8)} ${"false alarm".padStart(12)}\n`);
        for (const peak of periodogram.peaks)
          io.stdout(`  ${peak.period.toPrecision(6).padStart(12)} ${peak.frequency.toPrecision(6).padStart(12)} ${peak.power.toFixed(4).padStart(8)} ${peak.falseAlarm.toExponential(2).padStart(12)}\n`);
      }
      if (csv.length === 0) csv.push(lightCurves.length > 1 ? "band,frequency,period,power" : "frequency,period,power");
      for (let i = 0; i < periodogram.frequency.length; i++) {
        const f = periodogram.frequency[i];
        const row = `${f},${f > 0 ? 1 / f : Infinity},${periodogram.power[i]}`;
        csv.push(lightCurves.length > 1 ? `${lightCurve.band},${row}` : row);
      }
    }
    const out = textOption(values, "out");
    if (out !== undefined) writeOutput(csv.join("\n") + "\n", out, io);
    return 0;
  },
};
