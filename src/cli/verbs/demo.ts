import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { dirname, join, resolve } from "node:path";
import { readLightCurves } from "../../lightcurve/read-light-curves.js";
import { posteriorPredictive } from "../../models/posterior-predictive.js";
import { evenlySpacedItems } from "../../numerics/even-thinning.js";
import { reportInputFromFit } from "../../report/report-from-fit.js";
import { writeReport } from "../../report/write-report.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";
import { seedOption, textOption, withParsedArguments } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";
import { fitAll } from "../fit-light-curves.js";
import { predictionCsv } from "../../models/prediction-csv.js";
import { jointReportInput } from "../../report/joint-report-input.js";
import { fitJointWithProgress } from "../fit-bands.js";

const HELP = `Usage: horologium demo [--out DIR] [--seed N] [--no-report] [--quiet]

Runs the main job on the built-in demo data, three invented objects of the invented Lanternfield
Deep Survey (eight, three and four seasons with ~6-month gaps):
  1. quasar LDS J0412-2731 (redshift 1.62): damped random walk; timescale, SF_inf, rest-frame
     timescale, and a forecast across the next seasonal gap;
  2. spotted star LDS V-2291: quasi-periodic rotation; period with its interval, after checking
     the periodogram's aliases;
  3. quasar LDS J2207+0134 in six bands visited in turn: one damped random walk fitted to all
     bands at once, with each band's amplitude and lag relative to g.
Prints a summary and writes to DIR (default horologium-demo): the fit results (JSON), the gap
forecast (CSV) and an HTML report with figures per object.

Options:
  --out DIR               output folder (default horologium-demo)
  --seed N                seed of every random choice (default 1): same seed, same results
  --no-report             skip the HTML reports
  --quiet                 print nothing

Example:
  horologium demo --out demo-results --seed 3
`;

const OPTIONS = { out: { type: "string" }, seed: { type: "string" }, "no-report": { type: "boolean" }, quiet: { type: "boolean" } } as const;

/** The folder of the built-in demo light curves (shipped beside dist/). */
export function demoDataDirectory(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  for (const candidate of [resolve(here, "../../../demo"), resolve(here, "../../../../demo")])
    if (existsSync(join(candidate, "lds-j0412-2731-quasar.csv"))) return candidate;
  throw new UsageError("the built-in demo data (demo/*.csv) are missing from this installation");
}

/** `horologium demo`. */
export const verb: CliVerb = {
  summary: "fit the built-in demo data: an invented quasar, an invented spotted star and an invented six-band quasar",
  run: withParsedArguments(OPTIONS, HELP, async ({ values }, io: CliIo) => {
    const quiet = values.quiet === true;
    const out = resolve(io.cwd, textOption(values, "out") ?? "horologium-demo");
    const seed = seedOption(values);
    const data = demoDataDirectory();
    const say = (text: string) => {
      if (!quiet) io.stdout(text);
    };
    say(`Horologium demo: the Lanternfield Deep Survey (invented data), results in ${out}\n\n`);

    const quasarFile = join(data, "lds-j0412-2731-quasar.csv");
    const [quasar] = (await readLightCurves(quasarFile)).lightCurves;
    say(`1. Quasar LDS J0412-2731 (z = 1.62): ${quasar.time.length} epochs over ${(quasar.time[quasar.time.length - 1] - quasar.time[0]).toFixed(0)} d\n`);
    await fitAll([quasar], { model: "drw", seed, redshift: 1.62 }, { ...io, stdout: io.stdout, stderr: quiet ? () => undefined : io.stdout }, quiet, async (lightCurve, fit) => {
      writeOutput(JSON.stringify(fit.result, null, 2) + "\n", join(out, "quasar-result.json"), io);
      // Forecast: from the last epoch to the end of the next observing season (across the gap).
      const last = lightCurve.time[lightCurve.time.length - 1];
      const grid = Float64Array.from({ length: 121 }, (_, i) => last + 3 * i);
      const rows = fit.result.posteriorSample.rows;
      // 200 draws spread over every chain (the stored sample is ordered chain by chain).
      const forecast = posteriorPredictive(fit.model, lightCurve, evenlySpacedItems(rows, 200), grid);
      writeOutput(predictionCsv(forecast), join(out, "quasar-forecast.csv"), io);
      const mid = 60;
      say(
        `   forecast ${(grid[mid] - last).toFixed(0)} d after the last epoch: ${forecast.mean[mid].toFixed(3)} mag, ` +
          `95% interval [${forecast.lower95[mid].toFixed(3)}, ${forecast.upper95[mid].toFixed(3)}]\n`,
      );
      if (values["no-report"] !== true) {
        const written = await writeReport(reportInputFromFit(lightCurve, fit.result, fit.model), join(out, "quasar-report"));
        say(`   report: ${written.html}\n`);
      }
    });

    const starFile = join(data, "lds-v2291-spotted-star.csv");
    const [star] = (await readLightCurves(starFile)).lightCurves;
    say(`\n2. Spotted star LDS V-2291: ${star.time.length} epochs over ${(star.time[star.time.length - 1] - star.time[0]).toFixed(0)} d\n`);
    await fitAll([star], { model: "quasi-periodic", seed }, { ...io, stderr: quiet ? () => undefined : io.stdout }, quiet, async (lightCurve, fit) => {
      writeOutput(JSON.stringify(fit.result, null, 2) + "\n", join(out, "spotted-star-result.json"), io);
      const modes = fit.result.periodModes ?? [];
      if (modes.length > 0 && fit.result.periodogramPeriod !== undefined)
        say(`   period modes checked (periodogram peak ${fit.result.periodogramPeriod.toFixed(3)} d and its aliases): ${modes.map((m) => `${m.period.toFixed(3)} d (${(100 * m.probability).toFixed(1)}%)`).join(", ")}\n`);
      if (values["no-report"] !== true) {
        const written = await writeReport(reportInputFromFit(lightCurve, fit.result, fit.model), join(out, "spotted-star-report"));
        say(`   report: ${written.html}\n`);
      }
    });
    const sixBandFile = join(data, "lds-j2207-0134-six-band-quasar.csv");
    const bands = (await readLightCurves(sixBandFile)).lightCurves;
    const visits = bands.reduce((total, band) => total + band.time.length, 0);
    say(`\n3. Quasar LDS J2207+0134 in ${bands.length} bands (${bands.map((band) => band.band).join(" ")}): ${visits} visits, one band per visit\n`);
    const choice = { kind: "joint", lags: true, referenceBand: "g" } as const;
    const joint = fitJointWithProgress(bands, { model: "drw", seed }, choice, { ...io, stderr: quiet ? () => undefined : io.stdout }, quiet);
    writeOutput(JSON.stringify(joint.result, null, 2) + "\n", join(out, "six-band-quasar-result.json"), io);
    if (values["no-report"] !== true) {
      const written = await writeReport(jointReportInput(joint), join(out, "six-band-quasar-report"));
      say(`   report: ${written.html}\n`);
    }
    say(`\nDone. The JSON results follow the format in docs/architecture.md ("Result JSON"); try "horologium report ${join(out, "quasar-result.json")}" or "horologium fit --help".\n`);
    return 0;
  }),
};
