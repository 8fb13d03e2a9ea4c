import { InputError } from "../errors/input-error.js";
import {
  RESULT_FORMAT_VERSION,
  type DerivedSummary,
  type FitChoices,
  type FitDataSummary,
  type FitDiagnostics,
  type FitParameterSummary,
  type FitResult,
  type JointBandsSummary,
  type PeriodModeSummary,
  type PriorDescription,
  type RobustFlaggedPoint,
  type RobustNoiseSummary,
  type StoredChainTrace,
  type StoredImportanceWeights,
  type StoredPosteriorSample,
  type StoredTraceSeries,
} from "./fit-result.js";
import { MODEL_NAMES, type ModelName } from "./light-curve-model.js";

/**
 * Reads a parsed fit-result JSON value, checking every key of {@link FitResult}, and returns it typed. A
 * statistic written as `null` (how JSON writes NaN, for example the summary of a run cancelled before any
 * draw) reads back as NaN. Problems end in one {@link InputError} naming the file and the field
 * (`result.json: field "diagnostics.rhatMax" must be a number, got "high"`), and a file of an older
 * format says so (docs/architecture.md, "Result JSON").
 *
 * @param value the parsed JSON of one result
 * @param file the file it came from, for the message
 * @param label what to call the value in messages when it is one of several (for example "result 2")
 */
export function parseFitResult(value: unknown, file: string, label?: string): FitResult {
  const where = (problem: string) => new InputError(label ? `${label}: ${problem}` : problem, { file });
  if (!isRecord(value) || !("parameters" in value || "formatVersion" in value))
    throw where("not a horologium fit result (no \"formatVersion\" or \"parameters\")");
  if (!("formatVersion" in value))
    throw where(`written by an older version of horologium (a result file without "formatVersion"; this version reads format ${RESULT_FORMAT_VERSION}): fit the light curve again`);
  const version = value.formatVersion;
  if (version !== RESULT_FORMAT_VERSION) {
    const older = typeof version === "number" && version < RESULT_FORMAT_VERSION;
    throw where(
      older
        ? `written in the older result format ${version} (this version reads format ${RESULT_FORMAT_VERSION}): fit the light curve again`
        : `written in result format ${JSON.stringify(version)}, which this version of horologium (format ${RESULT_FORMAT_VERSION}) does not know: update horologium`,
    );
  }
  const fields = new Fields(value, "", where);
  const model = fields.text("model");
  if (!MODEL_NAMES.includes(model as ModelName)) throw where(`field "model" must be one of ${MODEL_NAMES.join(", ")}, got ${JSON.stringify(model)}`);
  const seed = fields.get("seed");
  if (typeof seed !== "number" && typeof seed !== "string") throw fields.wrong("seed", "a number or a string");
  const periodModes = fields.optional("periodModes", (f, key) => f.list(key, periodMode));
  const periodCandidates = fields.optional("periodCandidates", (f, key) => f.list(key, periodMode));
  const periodogramPeriod = fields.optional("periodogramPeriod", (f, key) => f.number(key));
  const robust = fields.optional("robust", (f, key) => robustSummary(f.object(key)));
  const bands = fields.optional("bands", (f, key) => jointBands(f.object(key)));
  const chainTraces = fields.optional("chainTraces", (f, key) => f.list(key, (g, index) => chainTrace(g.object(index))));
  const importanceWeights = fields.optional("importanceWeights", (f, key) => f.list(key, (g, index) => weightsOfImportance(g.object(index))));
  return {
    formatVersion: RESULT_FORMAT_VERSION,
    model: model as ModelName,
    seed,
    version: fields.text("version"),
    data: dataSummary(fields.object("data")),
    parameters: fields.record("parameters", (f, name) => parameterSummary(f.object(name))),
    derived: fields.record("derived", (f, name): DerivedSummary => {
      const summary = f.object(name);
      return { ...parameterSummary(summary), description: summary.text("description") };
    }),
    diagnostics: diagnostics(fields.object("diagnostics")),
    warnings: fields.list("warnings", (f, index) => f.text(index)),
    options: choices(fields.object("options")),
    ...(robust !== undefined ? { robust } : {}),
    ...(bands !== undefined ? { bands } : {}),
    priors: fields.record("priors", (f, name): PriorDescription => {
      const prior = f.object(name);
      return { family: prior.text("family"), settings: prior.record("settings", (s, key) => s.number(key)) };
    }),
    maximumPosterior: fields.record("maximumPosterior", (f, name) => f.number(name)),
    ...(periodModes !== undefined ? { periodModes } : {}),
    ...(periodCandidates !== undefined ? { periodCandidates } : {}),
    ...(periodogramPeriod !== undefined ? { periodogramPeriod } : {}),
    posteriorSample: posteriorSample(fields.object("posteriorSample")),
    ...(chainTraces !== undefined ? { chainTraces } : {}),
    ...(importanceWeights !== undefined ? { importanceWeights } : {}),
  };
}

function dataSummary(f: Fields): FitDataSummary {
  const unit = f.text("unit");
  if (unit !== "mag" && unit !== "flux") throw f.wrong("unit", '"mag" or "flux"');
  const band = f.optional("band", (g, key) => g.text(key));
  const placeholders = f.optional("placeholders", (g, key) => g.count(key));
  return {
    n: f.count("n"),
    dropped: f.count("dropped"),
    ...(placeholders !== undefined ? { placeholders } : {}),
    baseline: f.number("baseline"),
    medianCadence: f.number("medianCadence"),
    timeColumn: f.text("timeColumn"),
    valueColumn: f.text("valueColumn"),
    errorColumn: f.get("errorColumn") === null ? null : f.text("errorColumn"),
    source: f.text("source"),
    unit,
    ...(band !== undefined ? { band } : {}),
  };
}

function parameterSummary(f: Fields): FitParameterSummary {
  const hdi = f.list("hdi95", (g, index) => g.number(index));
  if (hdi.length !== 2) throw f.wrong("hdi95", "two numbers [lower, upper]");
  return {
    median: f.number("median"),
    mean: f.number("mean"),
    sd: f.number("sd"),
    "q2.5": f.number("q2.5"),
    q16: f.number("q16"),
    q84: f.number("q84"),
    "q97.5": f.number("q97.5"),
    hdi95: [hdi[0], hdi[1]],
  };
}

function periodMode(f: Fields, index: number): PeriodModeSummary {
  const mode = f.object(index);
  return { period: mode.number("period"), probability: mode.number("probability") };
}

const POSTERIOR_METHODS = ["importance", "ensemble", "nuts"] as const;

function diagnostics(f: Fields): FitDiagnostics {
  const sampler = f.optional("sampler", (g, key) => g.text(key));
  if (sampler !== undefined && sampler !== "nuts" && sampler !== "ensemble") throw f.wrong("sampler", '"nuts" or "ensemble"');
  // Results written before `method` was added were all MCMC, named by `sampler`.
  const method = f.optional("method", (g, key) => g.text(key)) ?? sampler;
  if (method !== "mixed" && !POSTERIOR_METHODS.includes(method as (typeof POSTERIOR_METHODS)[number]))
    throw f.wrong("method", '"importance", "ensemble", "nuts" or "mixed"');
  if (method !== "importance" && sampler === undefined) throw f.wrong("sampler", '"nuts" or "ensemble"');
  const stopReason = f.text("stopReason");
  if (stopReason !== "converged" && stopReason !== "budget" && stopReason !== "cancelled")
    throw f.wrong("stopReason", '"converged", "budget" or "cancelled"');
  const keptDraws = f.optional("keptDraws", (g, key) => g.count(key));
  // R-hat, the autocorrelation time and the acceptance belong to MCMC; importance sampling writes null.
  const markovFigure = (key: string): number | null => {
    if (method !== "importance") return f.number(key);
    if (f.get(key) !== null) throw f.wrong(key, "null (importance sampling has no such figure)");
    return null;
  };
  const methods = f.optional("methods", (g, key) =>
    g.list(key, (h, index) => {
      const m = h.text(index);
      if (!POSTERIOR_METHODS.includes(m as (typeof POSTERIOR_METHODS)[number])) throw h.wrong(index, '"importance", "ensemble" or "nuts"');
      return m as (typeof POSTERIOR_METHODS)[number];
    }),
  );
  const paretoK = f.optional("paretoK", (g, key) => g.number(key));
  const paretoKThreshold = f.optional("paretoKThreshold", (g, key) => g.number(key));
  const importanceDraws = f.optional("importanceDraws", (g, key) => g.count(key));
  const importanceFallback = f.optional("importanceFallback", (g, key) => g.text(key));
  return {
    converged: f.flag("converged"),
    rhatMax: markovFigure("rhatMax"),
    rhatThreshold: markovFigure("rhatThreshold"),
    essMin: f.number("essMin"),
    autocorrelationTime: markovFigure("autocorrelationTime"),
    acceptance: markovFigure("acceptance"),
    likelihoodEvaluations: f.number("likelihoodEvaluations"),
    seconds: f.number("seconds"),
    method: method as FitDiagnostics["method"],
    ...(methods !== undefined ? { methods } : {}),
    ...(sampler !== undefined ? { sampler } : {}),
    stopReason,
    ...(keptDraws !== undefined ? { keptDraws } : {}),
    ...(paretoK !== undefined ? { paretoK } : {}),
    ...(paretoKThreshold !== undefined ? { paretoKThreshold } : {}),
    ...(importanceDraws !== undefined ? { importanceDraws } : {}),
    ...(importanceFallback !== undefined ? { importanceFallback } : {}),
  };
}

function choices(f: Fields): FitChoices {
  const background = f.optional("background", (g, key) => g.text(key));
  if (background !== undefined && background !== "drw") throw f.wrong("background", '"drw"');
  const redshift = f.optional("redshift", (g, key) => g.number(key));
  const jitter = f.optional("jitter", (g, key) => g.flag(key));
  const robust = f.optional("robust", (g, key) => g.flag(key));
  const bands = f.optional("bands", (g, key) => g.text(key));
  if (bands !== undefined && bands !== "joint") throw f.wrong("bands", '"joint"');
  const lags = f.optional("lags", (g, key) => g.flag(key));
  const referenceBand = f.optional("referenceBand", (g, key) => g.text(key));
  const order = f.optional("order", (g, key) => g.text(key));
  return {
    ...(order !== undefined ? { order } : {}),
    ...(bands !== undefined ? { bands } : {}),
    ...(lags !== undefined ? { lags } : {}),
    ...(referenceBand !== undefined ? { referenceBand } : {}),
    ...(background !== undefined ? { background } : {}),
    ...(redshift !== undefined ? { redshift } : {}),
    ...(jitter !== undefined ? { jitter } : {}),
    ...(robust !== undefined ? { robust } : {}),
  };
}

function jointBands(f: Fields): JointBandsSummary {
  if (f.text("fit") !== "joint") throw f.wrong("fit", '"joint"');
  const lagRange = f.optional("lagRange", (g, key) => g.number(key));
  return {
    fit: "joint",
    names: f.list("names", (g, index) => g.text(index)),
    reference: f.text("reference"),
    points: f.record("points", (g, key) => g.count(key)),
    dropped: f.record("dropped", (g, key) => g.count(key)),
    ...(lagRange !== undefined ? { lagRange } : {}),
  };
}

function robustSummary(f: Fields): RobustNoiseSummary {
  const weights = f.object("weightSummary");
  return {
    noise: f.text("noise"),
    degreesOfFreedom: f.number("degreesOfFreedom"),
    likelyOutliers: f.count("likelyOutliers"),
    points: f.count("points"),
    weightParameters: f.record("weightParameters", (g, key) => g.number(key)),
    weightSummary: { minimum: weights.number("minimum"), median: weights.number("median"), maximum: weights.number("maximum"), belowHalf: weights.count("belowHalf") },
    flagged: f.list("flagged", (g, index): RobustFlaggedPoint => {
      const point = g.object(index);
      return {
        index: point.count("index"),
        time: point.number("time"),
        value: point.number("value"),
        weight: point.number("weight"),
        outlierProbability: point.number("outlierProbability"),
      };
    }),
  };
}

function posteriorSample(f: Fields): StoredPosteriorSample {
  const names = f.list("names", (g, index) => g.text(index));
  const chain = f.list("chain", (g, index) => g.count(index));
  const rows = f.list("rows", (g, index) => {
    const row = g.list(index, (h, k) => h.number(k));
    if (row.length !== names.length) throw g.wrong(index, `${names.length} numbers (one per name)`);
    return row;
  });
  if (chain.length !== rows.length) throw f.wrong("chain", `one chain number per row (${rows.length})`);
  return { names, chain, rows };
}

function chainTrace(f: Fields): StoredChainTrace {
  const sampler = f.text("sampler");
  if (sampler !== "nuts" && sampler !== "ensemble") throw f.wrong("sampler", '"nuts" or "ensemble"');
  const steps = f.list("steps", (g, index) => g.count(index));
  const names = f.list("names", (g, index) => g.text(index));
  const series = f.list("series", (g, index): StoredTraceSeries => {
    const s = g.object(index);
    const chain = s.get("chain") === null ? null : s.count("chain");
    const sameLength = (h: Fields, key: string) => {
      const values = h.list(key, (v, k) => v.number(k));
      if (values.length !== steps.length) throw h.wrong(key, `${steps.length} numbers (one per step)`);
      return values;
    };
    const values = s.object("values");
    return {
      label: s.text("label"),
      chain,
      values: Object.fromEntries(names.map((name) => [name, sameLength(values, name)])),
      logPosterior: sameLength(s, "logPosterior"),
    };
  });
  return { sampler, chains: f.count("chains"), iterations: f.count("iterations"), warmup: f.count("warmup"), steps, names, series };
}

function weightsOfImportance(f: Fields): StoredImportanceWeights {
  const ranks = f.list("ranks", (g, index) => g.count(index));
  const scaledWeights = f.list("scaledWeights", (g, index) => g.number(index));
  if (scaledWeights.length !== ranks.length) throw f.wrong("scaledWeights", `one number per rank (${ranks.length})`);
  return {
    draws: f.count("draws"),
    paretoK: f.number("paretoK"),
    paretoKThreshold: f.number("paretoKThreshold"),
    effectiveSampleSize: f.number("effectiveSampleSize"),
    ranks,
    scaledWeights,
  };
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === "object" && !Array.isArray(value);
}

function describe(value: unknown): string {
  if (value === undefined) return "nothing (the field is missing)";
  const text = JSON.stringify(value);
  return text.length > 40 ? `${text.slice(0, 37)}...` : text;
}

/** The fields of one JSON object (or array) at `path`, read with checks that name the full path on failure. */
class Fields {
  constructor(
    private readonly value: Readonly<Record<string | number, unknown>>,
    private readonly path: string,
    private readonly problem: (text: string) => InputError,
  ) {}

  private at(key: string | number): string {
    return typeof key === "number" ? `${this.path}[${key}]` : this.path ? `${this.path}.${key}` : key;
  }

  get(key: string | number): unknown {
    return this.value[key];
  }

  /** The error for a field that is not what it should be. */
  wrong(key: string | number, expected: string): InputError {
    return this.problem(`field "${this.at(key)}" must be ${expected}, got ${describe(this.get(key))}`);
  }

  /** A finite number, or NaN for `null` (JSON's NaN and infinities). */
  number(key: string | number): number {
    const value = this.get(key);
    if (value === null) return NaN;
    if (typeof value !== "number") throw this.wrong(key, "a number");
    return value;
  }

  /** A non-negative integer. */
  count(key: string | number): number {
    const value = this.get(key);
    if (typeof value !== "number" || !Number.isInteger(value) || value < 0) throw this.wrong(key, "a non-negative integer");
    return value;
  }

  text(key: string | number): string {
    const value = this.get(key);
    if (typeof value !== "string") throw this.wrong(key, "a string");
    return value;
  }

  flag(key: string | number): boolean {
    const value = this.get(key);
    if (typeof value !== "boolean") throw this.wrong(key, "true or false");
    return value;
  }

  object(key: string | number): Fields {
    const value = this.get(key);
    if (!isRecord(value)) throw this.wrong(key, "an object");
    return new Fields(value, this.at(key), this.problem);
  }

  /** An array, each item read by `read` (given the array's fields and the item's index). */
  list<T>(key: string | number, read: (fields: Fields, index: number) => T): T[] {
    const value = this.get(key);
    if (!Array.isArray(value)) throw this.wrong(key, "an array");
    // An array is an object whose keys are its indices.
    const items = new Fields(value as unknown as Readonly<Record<number, unknown>>, this.at(key), this.problem);
    return value.map((_, index) => read(items, index));
  }

  /** An object used as a map: every entry read by `read` (given the map's fields and the entry's name). */
  record<T>(key: string | number, read: (fields: Fields, name: string) => T): Record<string, T> {
    const map = this.object(key);
    const out: Record<string, T> = {};
    for (const name of Object.keys(map.value)) out[name] = read(map, name);
    return out;
  }

  /** The field read by `read` when present (not undefined), else undefined. */
  optional<T>(key: string, read: (fields: Fields, key: string) => T): T | undefined {
    return this.get(key) === undefined ? undefined : read(this, key);
  }
}
