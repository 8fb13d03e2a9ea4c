import { UsageError } from "../errors/usage-error.js";
import {
  KERNEL_FAMILIES,
  familyOfExpression,
  parameterUnit,
  parameterValidity,
  type AnyKernelFamily,
  type FamilyParameter,
  type Kernel,
} from "../kernels/index.js";

/** The families a kernel expression may name (those with an `expressionName`), in the descriptors' order. */
export const EXPRESSION_FAMILIES: readonly AnyKernelFamily[] = (KERNEL_FAMILIES as readonly AnyKernelFamily[]).filter(
  (family) => family.expressionName !== undefined,
);

/** A family's parameter list for help and error texts, e.g. "sigma, tau". */
function expressionParameters(family: AnyKernelFamily): string {
  return family.parameters.map((p) => p.name).join(", ");
}

/**
 * Help text for the families of kernel expressions: per family its name and summary, then one line per
 * parameter with what it is, its unit (time: the input time unit; value: the unit of the data) and validity.
 */
export function expressionFamiliesHelp(indent = "  "): string {
  const parameterLine = (p: FamilyParameter) => {
    const unit = parameterUnit(p.kind);
    return `${indent}    ${p.name.padEnd(15)} ${p.description}${unit === "none" ? "" : ` [${unit}]`}, ${parameterValidity(p.kind)}`;
  };
  return EXPRESSION_FAMILIES.map((family) =>
    [`${indent}${family.expressionName}: ${family.summary}`, ...family.parameters.map(parameterLine)].join("\n"),
  ).join("\n");
}

/**
 * Parses a kernel expression such as `quasi-periodic(sigma=0.01,period=11.3,decayTime=30,harmonicWeight=0.3)+drw(sigma=0.05,tau=400)`:
 * families with named parameters (their descriptors in kernels/families.ts), combined with `+` and `*`
 * (`*` binds tighter). Throws a UsageError naming the problem; parameter values are checked by the kernels
 * themselves (RangeError naming the parameter).
 */
export function parseKernelExpression(text: string): Kernel {
  const sum = text.split("+").map((term) => term.trim());
  if (sum.some((t) => t === "")) throw new UsageError(`kernel expression "${text}" has an empty term`);
  let result: Kernel | undefined;
  for (const term of sum) {
    let product: Kernel | undefined;
    for (const factor of term.split("*").map((f) => f.trim())) {
      const kernel = parseFamily(factor);
      product = product ? product.times(kernel) : kernel;
    }
    result = result ? result.plus(product!) : product;
  }
  return result!;
}

function parseFamily(text: string): Kernel {
  const match = /^([a-z0-9-]+)\s*\((.*)\)$/i.exec(text);
  if (!match) throw new UsageError(`"${text}" is not a kernel like drw(sigma=0.2,tau=300)`);
  const [, name, body] = match;
  const family = familyOfExpression(name);
  if (!family) throw new UsageError(`unknown kernel "${name}" (choose ${EXPRESSION_FAMILIES.map((f) => f.expressionName).join(", ")})`);
  const values: Record<string, number> = {};
  for (const pair of body.split(",").map((p) => p.trim()).filter((p) => p !== "")) {
    const [key, raw] = pair.split("=").map((s) => s?.trim());
    const value = Number(raw);
    if (!key || raw === undefined || raw === "" || !Number.isFinite(value)) throw new UsageError(`"${pair}" in ${name}(...) is not name=number`);
    values[key] = value;
  }
  const listed = `(parameters: ${expressionParameters(family)})`;
  // A parameter written `period<k>` stands for period0, period1, ...; those without an index are required.
  const patterns = family.parameters.map((p) => new RegExp(`^${p.name.replace(/<[a-z]>$/, "\\d+")}$`));
  for (const p of family.parameters) if (!p.name.includes("<") && !(p.name in values)) throw new UsageError(`${name}(...) needs ${p.name} ${listed}`);
  for (const key of Object.keys(values)) if (!patterns.some((pattern) => pattern.test(key))) throw new UsageError(`${name}(...) has no parameter ${key} ${listed}`);
  return family.fromExpression(values);
}
