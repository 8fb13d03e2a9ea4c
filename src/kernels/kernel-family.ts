import type { Kernel } from "./kernel.js";

/**
 * What a kernel parameter measures. The kind fixes the parameter's unit and validity here, and its
 * data-driven prior and first guess in the models (models/parameter-priors.ts), so that a new kernel whose
 * parameters are of known kinds gets all of these without further code.
 */
export type ParameterKind =
  /** A standard deviation, in the unit of the data; > 0. */
  | "amplitude"
  /** A damping, decorrelation or smoothness timescale, in the input time unit; > 0. */
  | "timescale"
  /** A period, in the input time unit; > 0. */
  | "period"
  /** The coherence (envelope e-folding) time of a periodic signal, in the input time unit; > 0. */
  | "coherence"
  /** A quality factor (dimensionless); > 0. */
  | "quality"
  /** A fraction of the variance (dimensionless); in [0, 1]. */
  | "fraction"
  /** Any other dimensionless shape parameter; > 0. */
  | "shape"
  /** A real coefficient (dimensionless), such as a moving-average coefficient; any finite value. */
  | "coefficient";

/** The unit a parameter carries: the data's time unit, the data's value unit, or none. */
export type ParameterUnit = "time" | "value" | "none";

/** One parameter of a kernel family. */
export interface FamilyParameter {
  /** The name in the library, the CLI and fit results (a CLI pattern such as `period<k>` for indexed lists). */
  readonly name: string;
  readonly kind: ParameterKind;
  /** What it is, in a few words, for help texts. */
  readonly description: string;
}

/**
 * The amplitude parameter of every family but the damped random walk (whose sigma is described as the
 * long-term standard deviation): sigma, with k(0) = sigma^2.
 */
export const STANDARD_DEVIATION: FamilyParameter = { name: "sigma", kind: "amplitude", description: "standard deviation" };

/**
 * Everything the library, the CLI and the models need to know about one kernel family, in one place
 * (each family's file exports its descriptor; kernels/families.ts lists them).
 */
export interface KernelFamily<Name extends string = string, Parameters = never, Model extends string = string> {
  /** The constructor's name in the `kernels` namespace, e.g. `quasiPeriodic`. */
  readonly name: Name;
  /**
   * The family's name in CLI kernel expressions, e.g. `quasi-periodic` in `--kernel "quasi-periodic(...)"`;
   * absent for a family the CLI does not offer (one with no semiseparable form, which the CLI cannot run).
   */
  readonly expressionName?: string;
  /** One line: what the kernel is and what it is for. */
  readonly summary: string;
  /**
   * The parameters, in the order of the kernel's `parameterNames` and of the engine's gradient (for a family
   * with a variable number of parameters, the CLI's patterns).
   */
  readonly parameters: readonly FamilyParameter[];
  /** The constructor in physical parameters (validates; throws a RangeError naming a bad parameter). */
  readonly create: (parameters: Parameters) => Kernel;
  /** The kernel from values in `parameters` order; absent for families with a variable number of parameters. */
  readonly fromValues?: (values: readonly number[]) => Kernel;
  /** The kernel from the name=value pairs of a CLI expression whose names `parameters` admits. */
  readonly fromExpression: (values: Readonly<Record<string, number>>) => Kernel;
  /**
   * The ready-made model of the trade built on this family (`fit --model NAME`): its parameters are the
   * family's, amplitude last, then `mean`; `periodCycles` is how many cycles of the period the baseline must
   * hold (the period prior stops at baseline / periodCycles); `purpose` says in a few words what it is for,
   * for the model lists of the CLI's help and the browser page.
   */
  readonly model?: { readonly name: Model; readonly periodCycles: number; readonly purpose: string };
}

/** Any kernel family (the supertype of every descriptor, whatever its parameter object). */
export type AnyKernelFamily = KernelFamily<string, never, string>;

/** The unit of each kind of parameter. */
export function parameterUnit(kind: ParameterKind): ParameterUnit {
  if (kind === "amplitude") return "value";
  if (kind === "timescale" || kind === "period" || kind === "coherence") return "time";
  return "none";
}

/** The valid values of each kind of parameter, as text for help and error messages. */
export function parameterValidity(kind: ParameterKind): string {
  if (kind === "fraction") return "between 0 and 1";
  return kind === "coefficient" ? "finite" : "> 0";
}

/**
 * A descriptor for a family with a fixed list of parameters, from its kernel class: `create` constructs
 * the class, and `fromValues` and `fromExpression` build the parameter object from the list, so the
 * family's file states its parameters once.
 *
 * @example
 * export const matern32Family = fixedParameterFamily({
 *   name: "matern32", expressionName: "matern32", summary: "...", kernel: Matern32Kernel,
 *   parameters: [STANDARD_DEVIATION, { name: "scale", kind: "timescale", description: "length scale" }],
 * });
 */
export function fixedParameterFamily<const Name extends string, Parameters, const Model extends string = never>(
  spec: Omit<KernelFamily<Name, Parameters, Model>, "create" | "fromValues" | "fromExpression"> & {
    /** The family's kernel class, constructed from its parameter object (which it validates). */
    readonly kernel: new (parameters: Parameters) => Kernel;
  },
): KernelFamily<Name, Parameters, Model> & { readonly fromValues: (values: readonly number[]) => Kernel } {
  const { kernel: KernelClass, ...descriptor } = spec;
  const names = spec.parameters.map((p) => p.name);
  const create = (parameters: Parameters): Kernel => new KernelClass(parameters);
  // A record with exactly the family's parameter names is its parameter object (every one a number).
  const fromRecord = (values: Readonly<Record<string, number>>) => create(values as Parameters);
  return {
    ...descriptor,
    create,
    fromValues: (values) => fromRecord(Object.fromEntries(names.map((name, i) => [name, values[i]]))),
    fromExpression: fromRecord,
  };
}
