import { GaussianProcess } from "../../gp/gaussian-process.js";
import { continuousSpaceCadence, seasonalGroundCadence } from "../../lightcurve/cadence.js";
import { formatLightCurveCsv } from "../../lightcurve/light-curve-csv.js";
import { observeMagnitudes } from "../../lightcurve/simulated-photometry.js";
import { createRng } from "../../random/rng.js";
import type { CliIo, CliVerb } from "../cli-io.js";
import { UsageError } from "../../errors/usage-error.js";
import { expressionFamiliesHelp, parseKernelExpression } from "../kernel-expression.js";
import { numberOption, seedOption, textOption, valueOptions, withParsedArguments } from "../verb-arguments.js";
import { writeOutput } from "../write-output.js";

const HELP = `Usage: horologium simulate --kernel EXPRESSION [options]

Simulates a light curve in magnitudes: a draw of a Gaussian process with any kernel, observed on a
seasonal ground-based cadence or a continuous space-like one, with per-point errors from the
Ivezic et al. 2019 (ApJ 873, 111, eq. 5) relation for a chosen 5-sigma depth. Writes CSV with
the columns time,mag,mag_err (times in days).

Kernel expressions combine families with + and * (for example a rotating star with a slow trend):
  quasi-periodic(sigma=0.02,period=11.3,decayTime=30,harmonicWeight=0.3)+drw(sigma=0.05,tau=400)
Families and parameters (time: the input time unit, in days here; value: the data's unit, mag):
${expressionFamiliesHelp()}

Options:
  --kernel EXPRESSION     the kernel (required)
  --mean MAG              mean magnitude (default 20)
  --cadence seasonal|continuous   ground seasons with ~6-month gaps, or a space-like 30-min cadence (default seasonal)
  --seasons N             observing seasons, one per year (seasonal; default 5)
  --revisit DAYS          mean spacing of visited nights (seasonal; default 3)
  --days D                length of the continuous cadence (default 90)
  --depth MAG             single-visit 5-sigma depth (default 24)
  --start T               time of the first night (default 60000, an MJD-like origin)
  --seed N                seed (default 1): same seed, same light curve
  --out FILE              write the CSV here (default: standard output)

Example (an invented Lanternfield quasar):
  horologium simulate --kernel "drw(sigma=0.2,tau=250)" --mean 20.3 --depth 23.5 --seasons 8 --seed 3 --out quasar.csv
`;

const OPTIONS = valueOptions("kernel", "mean", "cadence", "seasons", "revisit", "days", "depth", "start", "seed", "out");

/** `horologium simulate`. */
export const verb: CliVerb = {
  summary: "simulate a light curve from any kernel on a survey-like cadence (CSV)",
  run: withParsedArguments(OPTIONS, HELP, async ({ values, positionals }, io: CliIo) => {
    if (positionals.length > 0) throw new UsageError(`simulate takes no file argument, got "${positionals[0]}"`);
    const expression = textOption(values, "kernel");
    if (!expression) throw new UsageError("--kernel is required (see --help)");
    let kernel;
    try {
      kernel = parseKernelExpression(expression);
    } catch (error) {
      if (error instanceof RangeError) throw new UsageError(`--kernel: ${error.message}`);
      throw error;
    }
    const seed = seedOption(values);
    const rng = createRng(seed);
    const cadence = textOption(values, "cadence") ?? "seasonal";
    const start = numberOption(values, "start", 60000)!;
    let time: Float64Array;
    if (cadence === "seasonal") {
      const seasons = numberOption(values, "seasons", 5)!;
      if (!Number.isInteger(seasons) || seasons < 1) throw new UsageError(`--seasons must be a positive integer, got ${seasons}`);
      const revisitInterval = numberOption(values, "revisit", 3)!;
      if (!(revisitInterval > 0)) throw new UsageError(`--revisit must be > 0, got ${revisitInterval}`);
      time = seasonalGroundCadence({ start, seasons, revisitInterval }, rng);
    } else if (cadence === "continuous") {
      const days = numberOption(values, "days", 90)!;
      if (!(days > 0)) throw new UsageError(`--days must be > 0, got ${days}`);
      time = continuousSpaceCadence({ start, duration: days }, rng);
    } else {
      throw new UsageError(`--cadence must be seasonal or continuous, got "${cadence}"`);
    }
    const mean = numberOption(values, "mean", 20)!;
    const depth5Sigma = numberOption(values, "depth", 24)!;
    const truth = new GaussianProcess(kernel, time, { mean }).priorDraw(rng);
    const lightCurve = observeMagnitudes(time, truth, { depth5Sigma }, rng, `simulated: ${expression}, seed ${seed}`);
    writeOutput(formatLightCurveCsv(lightCurve, { comments: [`horologium simulate --kernel "${expression}" --seed ${seed}`, "times in days; magnitudes with Ivezic et al. 2019 errors"] }), textOption(values, "out"), io);
    return 0;
  }),
};
