import { computePeriodogram } from "../../periodogram/periodogram.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";
import { FIT_OPTIONS, periodLimits } from "../fit-arguments.js";
import { readInput } from "../read-input.js";
import { COLUMN_HELP, COLUMN_OPTIONS, numberOption, OUTPUT_OPTIONS, textOption, withSingleInput } from "../verb-arguments.js";
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
  ...OUTPUT_OPTIONS,
  "min-period": FIT_OPTIONS["min-period"],
  "max-period": FIT_OPTIONS["max-period"],
  oversampling: { type: "string" },
  peaks: { type: "string" },
} as const;

/** `horologium periodogram`. */
export const verb: CliVerb = {
  summary: "generalised Lomb-Scargle periodogram with false-alarm probabilities",
  run: withSingleInput(OPTIONS, HELP, async ({ values, file, quiet }, io: CliIo) => {
    // The period range by the rules of every verb that searches periods (cli/fit-arguments.ts).
    const { minimumPeriod: minPeriod, maximumPeriod: maxPeriod } = periodLimits(values);
    const oversampling = numberOption(values, "oversampling");
    const peaks = numberOption(values, "peaks", 5)!;
    if (oversampling !== undefined && !(oversampling > 0)) throw new UsageError(`--oversampling must be > 0, got ${oversampling}`);
    if (!Number.isInteger(peaks) || peaks < 1) throw new UsageError(`--peaks must be a positive integer, got ${peaks}`);
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
  }),
};
