import { UsageError } from "../errors/usage-error.js";
import { DEFAULT_SAMPLER, type SamplerKind } from "../inference/index.js";
import { KERNEL_FAMILIES } from "../kernels/families.js";
import type { AnyKernelFamily } from "../kernels/kernel-family.js";
import type { FitOptions } from "../models/fit-options.js";
import { MODEL_NAMES, type ModelName } from "../models/light-curve-model.js";
import { carmaOrderOf, orderText, parseCarmaOrder, type CarmaOrder } from "../models/carma-model.js";
import { BAND_OPTIONS } from "./band-choice.js";
import { COLUMN_OPTIONS, integerOption, numberOption, OUTPUT_OPTIONS, seedOption, textOption, type VerbArguments } from "./verb-arguments.js";

/**
 * The options that choose a fit, shared by every verb that fits (fit, predict, compare, batch and batch
 * plan): one declaration, one help text, one set of rules (docs/architecture.md, "Command line"). A verb
 * declares the subset it takes; {@link fitArguments} reads whichever are present.
 */
export const FIT_OPTIONS = {
  model: { type: "string" },
  order: { type: "string" },
  background: { type: "string" },
  seed: { type: "string" },
  redshift: { type: "string" },
  jitter: { type: "boolean" },
  robust: { type: "boolean" },
  sampler: { type: "string" },
  method: { type: "string" },
  "max-evaluations": { type: "string" },
  "min-period": { type: "string" },
  "max-period": { type: "string" },
} as const;

/**
 * Every option of a verb that fits the light curves of one file and writes one output (`fit`, `predict`):
 * the fit options, the column options, the band rule, `--out` and `--quiet`.
 */
export const FILE_FIT_OPTIONS = { ...COLUMN_OPTIONS, ...FIT_OPTIONS, ...BAND_OPTIONS, ...OUTPUT_OPTIONS } as const;

/** The models of the kernel families, each with what it is for (from the family's descriptor). */
const FAMILY_MODEL_HELP = (KERNEL_FAMILIES as readonly AnyKernelFamily[])
  .flatMap((family) => (family.model ? [`${family.model.name} (${family.model.purpose})`] : []))
  .join(", ");

/** The help lines of {@link FIT_OPTIONS}. */
export const FIT_HELP = `  --model NAME            ${FAMILY_MODEL_HELP},
                          or carma (continuous-time ARMA, Kelly et al. 2014; needs --order)
  --order p,q             the CARMA order: p autoregressive roots (1 to 4), q < p moving-average terms
  --background drw        add a slow damped random walk for trends
  --seed N                seed of every random choice, a non-negative integer (default 1):
                          same seed, same result
  --redshift Z            report the rest-frame timescale tau / (1 + Z) (drw)
  --jitter                fit a white-noise term even when there is an error column
  --robust                Student-t noise: down-weights outliers and reports each point's outlier
                          probability (needs an error column)
  --method auto|importance|mcmc  importance (= auto, the default without --sampler): importance
                          sampling from a proposal fitted at the mode (periodic models: one
                          component per period mode), MCMC when its diagnostics (k-hat, ESS) fail;
                          mcmc: MCMC only
  --sampler nuts|ensemble the MCMC sampler (default ${DEFAULT_SAMPLER}, the cheaper per effective draw
                          on these models); giving it implies --method mcmc
  --max-evaluations N     budget in log-likelihood evaluations, a positive integer (default 2e6);
                          a fit that runs out is reported with diagnostics.converged false
  --min-period P          shortest period searched and allowed (periodic models; default twice the
                          typical spacing of visits on different nights)
  --max-period P          longest period searched and allowed (default the baseline, or half of it
                          for quasi-periodic rotation, which needs two cycles)`;

/** The fit choices of a command line, validated: the options of a fit without its callbacks. */
export type FitArguments = Omit<FitOptions, "model" | "seed" | "onProgress" | "signal" | "clock" | "keptDraws" | "importance"> & {
  readonly model?: ModelName;
  readonly seed: number;
};

/**
 * Reads and checks the fit options present in `values` (see {@link FIT_OPTIONS}); throws a UsageError
 * naming the option and the rule. `modelRequired` makes `--model` compulsory.
 *
 * Rules: `--model` one of MODEL_NAMES; `--background` drw; `--seed` a non-negative integer no larger than
 * 2^53 - 1 (default 1; the per-object seeds of a batch are 48-bit integers, so `fit --seed` reproduces
 * them); `--redshift` a finite number >= 0; `--sampler` nuts or ensemble; `--max-evaluations` a positive
 * integer (exponent notation such as 2e6 allowed); `--min-period` and `--max-period` positive, the first
 * below the second; `--order p,q` (q < p <= 4) with `--model carma` only, and required by it.
 */
export function fitArguments(values: VerbArguments["values"], modelRequired: true): FitArguments & { readonly model: ModelName };
export function fitArguments(values: VerbArguments["values"], modelRequired: false): FitArguments;
export function fitArguments(values: VerbArguments["values"], modelRequired: boolean): FitArguments {
  const model = textOption(values, "model");
  if (model === undefined && modelRequired) throw new UsageError(`--model is required (${MODEL_NAMES.join(", ")})`);
  if (model !== undefined) modelName(model, "--model");
  const background = textOption(values, "background");
  if (background !== undefined && background !== "drw") throw new UsageError(`--background must be drw, got "${background}"`);
  const sampler = textOption(values, "sampler");
  if (sampler !== undefined && sampler !== "nuts" && sampler !== "ensemble")
    throw new UsageError(`--sampler must be nuts or ensemble, got "${sampler}"`);
  const method = textOption(values, "method");
  if (method !== undefined && method !== "auto" && method !== "importance" && method !== "mcmc")
    throw new UsageError(`--method must be auto, importance or mcmc, got "${method}"`);
  const redshift = numberOption(values, "redshift");
  if (redshift !== undefined && !(redshift >= 0)) throw new UsageError(`--redshift must be a number >= 0, got "${textOption(values, "redshift")}"`);
  const maxEvaluations = integerOption(values, "max-evaluations", 1);
  const order = carmaOrderOption(values, model);
  return {
    ...(model !== undefined ? { model: model as ModelName } : {}),
    seed: seedOption(values),
    ...(order !== undefined ? { order } : {}),
    ...(background !== undefined ? { background: "drw" as const } : {}),
    ...(values.jitter === true ? { jitter: true } : {}),
    ...(values.robust === true ? { robust: true } : {}),
    ...(redshift !== undefined ? { redshift } : {}),
    ...(sampler !== undefined ? { sampler: sampler as SamplerKind } : {}),
    ...(method !== undefined ? { method: method as "auto" | "importance" | "mcmc" } : {}),
    ...(maxEvaluations !== undefined ? { maxEvaluations } : {}),
    ...periodLimits(values),
  };
}

/** `text` as a model name, or a UsageError naming `option` and the models there are. */
export function modelName(text: string, option: string): ModelName {
  if (!MODEL_NAMES.includes(text as ModelName)) throw new UsageError(`${option} must be one of ${MODEL_NAMES.join(", ")}, got "${text}"`);
  return text as ModelName;
}

/**
 * The same choices written back as command-line arguments, in a fixed order (for the job scripts of
 * `batch plan`, whose tasks must fit exactly as asked).
 */
export function fitArgumentList(choice: FitArguments): string[] {
  const list: string[] = [];
  if (choice.model !== undefined) list.push("--model", choice.model);
  if (choice.order !== undefined) list.push("--order", orderText(carmaOrderOf(choice.order)));
  list.push("--seed", String(choice.seed));
  if (choice.background !== undefined) list.push("--background", choice.background);
  if (choice.redshift !== undefined) list.push("--redshift", String(choice.redshift));
  if (choice.jitter) list.push("--jitter");
  if (choice.robust) list.push("--robust");
  if (choice.sampler !== undefined) list.push("--sampler", choice.sampler);
  if (choice.method !== undefined) list.push("--method", choice.method);
  if (choice.maxEvaluations !== undefined) list.push("--max-evaluations", String(choice.maxEvaluations));
  if (choice.minimumPeriod !== undefined) list.push("--min-period", String(choice.minimumPeriod));
  if (choice.maximumPeriod !== undefined) list.push("--max-period", String(choice.maximumPeriod));
  return list;
}

/** `--order p,q`: required with `--model carma`, refused with any other model. */
function carmaOrderOption(values: VerbArguments["values"], model: string | undefined): CarmaOrder | undefined {
  const text = textOption(values, "order");
  if (model === "carma" && text === undefined) throw new UsageError("--model carma needs --order p,q (q < p <= 4), for example --order 2,1");
  if (text === undefined) return undefined;
  if (model !== undefined && model !== "carma") throw new UsageError("--order applies to --model carma only");
  try {
    return parseCarmaOrder(text);
  } catch (error) {
    throw new UsageError(`--order: ${(error as Error).message}`);
  }
}

/**
 * `--min-period` and `--max-period` as positive numbers, the first below the second (either may be absent):
 * the period range of every verb that searches periods (the fit options, `compare`, `periodogram`).
 */
export function periodLimits(values: VerbArguments["values"]): { minimumPeriod?: number; maximumPeriod?: number } {
  const minimumPeriod = numberOption(values, "min-period");
  const maximumPeriod = numberOption(values, "max-period");
  for (const [name, value] of [["min-period", minimumPeriod], ["max-period", maximumPeriod]] as const)
    if (value !== undefined && !(value > 0)) throw new UsageError(`--${name} must be > 0, got ${value}`);
  if (minimumPeriod !== undefined && maximumPeriod !== undefined && !(maximumPeriod > minimumPeriod))
    throw new UsageError(`--min-period (${minimumPeriod}) must be below --max-period (${maximumPeriod})`);
  return { ...(minimumPeriod !== undefined ? { minimumPeriod } : {}), ...(maximumPeriod !== undefined ? { maximumPeriod } : {}) };
}
