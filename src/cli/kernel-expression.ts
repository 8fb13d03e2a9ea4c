import { kernels, type Kernel } from "../kernels/index.js";
import { UsageError } from "../errors/usage-error.js";

/** The kernel families a kernel expression may name, with their parameter names. */
export const EXPRESSION_FAMILIES: Readonly<Record<string, string>> = {
  drw: "sigma, tau",
  oscillator: "sigma, period, quality",
  "quasi-periodic": "sigma, period, decayTime, harmonicWeight",
  matern32: "sigma, scale",
  carma: "sigma, period<k>, quality<k>, tau<k>, ma<j>",
};

/**
 * Parses a kernel expression such as `quasi-periodic(sigma=0.01,period=11.3,decayTime=30,harmonicWeight=0.3)+drw(sigma=0.05,tau=400)`:
 * families with named parameters, combined with `+` and `*` (`*` binds tighter). Throws a UsageError naming
 * the problem; parameter values are checked by the kernels themselves (RangeError naming the parameter).
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
  const [, family, body] = match;
  const values: Record<string, number> = {};
  for (const pair of body.split(",").map((p) => p.trim()).filter((p) => p !== "")) {
    const [key, raw] = pair.split("=").map((s) => s?.trim());
    const value = Number(raw);
    if (!key || raw === undefined || raw === "" || !Number.isFinite(value)) throw new UsageError(`"${pair}" in ${family}(...) is not name=number`);
    values[key] = value;
  }
  const need = (...names: string[]) => {
    for (const name of names) if (!(name in values)) throw new UsageError(`${family}(...) needs ${name} (parameters: ${EXPRESSION_FAMILIES[family]})`);
    for (const name of Object.keys(values)) if (!names.includes(name)) throw new UsageError(`${family}(...) has no parameter ${name} (parameters: ${EXPRESSION_FAMILIES[family]})`);
  };
  switch (family) {
    case "drw":
      need("sigma", "tau");
      return kernels.dampedRandomWalk({ sigma: values.sigma, tau: values.tau });
    case "oscillator":
      need("sigma", "period", "quality");
      return kernels.oscillator({ sigma: values.sigma, period: values.period, quality: values.quality });
    case "quasi-periodic":
      need("sigma", "period", "decayTime", "harmonicWeight");
      return kernels.quasiPeriodic({ sigma: values.sigma, period: values.period, decayTime: values.decayTime, harmonicWeight: values.harmonicWeight });
    case "matern32":
      need("sigma", "scale");
      return kernels.matern32({ sigma: values.sigma, scale: values.scale });
    case "carma": {
      const indices = (prefix: string) =>
        Object.keys(values).filter((k) => new RegExp(`^${prefix}\\d+$`).test(k)).map((k) => Number(k.slice(prefix.length))).sort((a, b) => a - b);
      const oscillations = indices("period").map((k) => ({ period: values[`period${k}`], quality: values[`quality${k}`] }));
      const timescales = indices("tau").map((k) => values[`tau${k}`]);
      const movingAverage = indices("ma").map((j) => values[`ma${j}`]);
      return kernels.carma({ sigma: values.sigma, oscillations, timescales, movingAverage });
    }
    default:
      throw new UsageError(`unknown kernel "${family}" (choose ${Object.keys(EXPRESSION_FAMILIES).join(", ")})`);
  }
}
