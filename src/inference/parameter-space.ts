import type { Rng } from "../random/rng.js";
import type { Prior } from "./priors.js";
import { transformForSupport, type Transform } from "./transforms.js";

/** One model parameter: its name, prior and transform, or a fixed value. */
export interface ParameterSpec {
  /** The physical name used in results (`tau`, `period`, `sigma`, ...). */
  readonly name: string;
  /** The prior, in the physical unit; required unless the parameter is fixed. */
  readonly prior?: Prior;
  /** The map from the real line onto the prior's support; by default the one that fits the support. */
  readonly transform?: Transform;
  /** When set the parameter is held at this value and is not sampled. */
  readonly fixed?: number;
}

/** A free parameter with everything resolved. */
export interface FreeParameter {
  readonly name: string;
  /** Position among all parameters (physical vectors). */
  readonly index: number;
  readonly prior: Prior;
  readonly transform: Transform;
}

/**
 * The parameters of a model and the map between physical vectors (every parameter, in declaration
 * order, fixed ones included) and unconstrained vectors (free parameters only, each mapped onto the
 * real line by its transform). Immutable.
 */
export interface ParameterSpace {
  /** All parameter names, in the order of physical vectors. */
  readonly names: readonly string[];
  /** The free parameters, in the order of unconstrained vectors. */
  readonly free: readonly FreeParameter[];
  /** Number of free parameters (length of unconstrained vectors). */
  readonly dimension: number;
  /** The declarations this space was built from. */
  readonly specs: readonly ParameterSpec[];
  /** Physical vector for an unconstrained one (fixed parameters at their values). */
  toPhysical(u: Float64Array, out?: Float64Array): Float64Array;
  /** Unconstrained vector for a physical one. */
  toUnconstrained(physical: Float64Array): Float64Array;
  /** Sum of the free parameters' ln prior densities at a physical vector. */
  logPrior(physical: Float64Array): number;
  /** Sum of ln |dx/du| over the free parameters at an unconstrained vector. */
  logJacobian(u: Float64Array): number;
  /** Physical vector from values by name; missing free values are filled with their prior median. */
  physicalFromRecord(values: Readonly<Record<string, number>>): Float64Array;
  /** Values by name of a physical vector. */
  recordFromPhysical(physical: Float64Array): Record<string, number>;
  /** An unconstrained draw from the prior (each free parameter independently, by inverse CDF). */
  drawFromPrior(rng: Rng): Float64Array;
}

/**
 * Builds a parameter space, checking names are unique, free parameters have priors and fixed values
 * are finite. Throws a RangeError that names the parameter otherwise.
 *
 * @example
 * const space = createParameterSpace([
 *   { name: "tau", prior: logUniformPrior(1, 1e4) },
 *   { name: "sigma", prior: logUniformPrior(1e-3, 10) },
 *   { name: "mean", fixed: 18.2 },
 * ]);
 */
export function createParameterSpace(specs: readonly ParameterSpec[]): ParameterSpace {
  const names = specs.map((s) => s.name);
  const seen = new Set<string>();
  const free: FreeParameter[] = [];
  const fixedValues = new Float64Array(specs.length);
  specs.forEach((spec, index) => {
    if (seen.has(spec.name)) throw new RangeError(`parameter "${spec.name}" is declared twice`);
    seen.add(spec.name);
    if (spec.fixed !== undefined) {
      if (!Number.isFinite(spec.fixed)) {
        throw new RangeError(`parameter "${spec.name}": fixed value must be finite, got ${spec.fixed}`);
      }
      fixedValues[index] = spec.fixed;
      return;
    }
    if (spec.prior === undefined) throw new RangeError(`parameter "${spec.name}" is free but has no prior`);
    const transform = spec.transform ?? transformForSupport(spec.prior.lower, spec.prior.upper);
    free.push({ name: spec.name, index, prior: spec.prior, transform });
  });
  const total = specs.length;
  const frozenSpecs = Object.freeze(specs.slice());

  const toPhysical = (u: Float64Array, out?: Float64Array): Float64Array => {
    const physical = out ?? new Float64Array(total);
    physical.set(fixedValues);
    for (let i = 0; i < free.length; i++) {
      const p = free[i];
      physical[p.index] = p.transform.fromUnconstrained(u[i]);
    }
    return physical;
  };

  return Object.freeze({
    names: Object.freeze(names),
    free: Object.freeze(free),
    dimension: free.length,
    specs: frozenSpecs,
    toPhysical,
    toUnconstrained(physical: Float64Array): Float64Array {
      const u = new Float64Array(free.length);
      for (let i = 0; i < free.length; i++) {
        const p = free[i];
        u[i] = p.transform.toUnconstrained(physical[p.index]);
      }
      return u;
    },
    logPrior(physical: Float64Array): number {
      let sum = 0;
      for (const p of free) sum += p.prior.logDensity(physical[p.index]);
      return sum;
    },
    logJacobian(u: Float64Array): number {
      let sum = 0;
      for (let i = 0; i < free.length; i++) sum += free[i].transform.logJacobian(u[i]);
      return sum;
    },
    physicalFromRecord(values: Readonly<Record<string, number>>): Float64Array {
      for (const key of Object.keys(values)) {
        if (!seen.has(key)) throw new RangeError(`unknown parameter "${key}" (known: ${names.join(", ")})`);
      }
      const physical = new Float64Array(fixedValues);
      for (const p of free) {
        const v = values[p.name];
        physical[p.index] = v !== undefined ? v : p.prior.quantile(0.5);
      }
      return physical;
    },
    recordFromPhysical(physical: Float64Array): Record<string, number> {
      const out: Record<string, number> = {};
      names.forEach((name, i) => (out[name] = physical[i]));
      return out;
    },
    drawFromPrior(rng: Rng): Float64Array {
      const u = new Float64Array(free.length);
      for (let i = 0; i < free.length; i++) {
        const p = free[i];
        // Keep clear of the support's ends, where the transform sends u to infinity.
        const q = 1e-6 + (1 - 2e-6) * rng.uniform();
        u[i] = p.transform.toUnconstrained(p.prior.quantile(q));
      }
      return u;
    },
  });
}

/**
 * A copy of the space with some parameters held fixed (by name). Parameters fixed here lose their
 * prior's influence; the others are unchanged.
 *
 * @example withFixedParameters(space, { mean: 18.2 })
 */
export function withFixedParameters(
  space: ParameterSpace,
  values: Readonly<Record<string, number>>,
): ParameterSpace {
  for (const key of Object.keys(values)) {
    if (!space.names.includes(key)) throw new RangeError(`unknown parameter "${key}"`);
  }
  return createParameterSpace(
    space.specs.map((spec) => (values[spec.name] !== undefined ? { ...spec, fixed: values[spec.name] } : spec)),
  );
}

/**
 * A copy of the space with a fixed parameter set free under the given prior (and optional transform).
 */
export function withFreeParameter(
  space: ParameterSpace,
  name: string,
  prior: Prior,
  transform?: Transform,
): ParameterSpace {
  if (!space.names.includes(name)) throw new RangeError(`unknown parameter "${name}"`);
  return createParameterSpace(
    space.specs.map((spec) => {
      if (spec.name !== name) return spec;
      const freed: ParameterSpec = { name, prior, ...(transform ? { transform } : {}) };
      return freed;
    }),
  );
}
