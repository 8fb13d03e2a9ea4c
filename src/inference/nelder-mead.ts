import type { LocalMinimum } from "./lbfgs.js";

/** Options of {@link minimizeNelderMead}. */
export interface NelderMeadOptions {
  /** Evaluation limit (default 400 * dimension). */
  readonly maxEvaluations?: number;
  /** Edge of the starting simplex along each axis (default 0.1 + 0.05 |x_i|). */
  readonly initialStep?: number | Float64Array;
  /** Stop when the simplex values differ by less than this, relative to max(1, |f|) (default 1e-10). */
  readonly valueTolerance?: number;
  /** ...and the simplex is smaller than this along every axis (default 1e-8). */
  readonly sizeTolerance?: number;
}

/**
 * Derivative-free minimisation by the Nelder-Mead simplex (Nelder & Mead 1965, Computer Journal 7,
 * 308; steps as in Lagarias et al. 1998, SIAM J. Optim. 9, 112) with the dimension-dependent
 * coefficients of Gao & Han 2012 (Comput. Optim. Appl. 51, 259): reflection 1, expansion 1 + 2/n,
 * contraction 0.75 - 1/(2n), shrink 1 - 1/n. Non-finite values count as +Infinity.
 *
 * @example minimizeNelderMead((x) => (x[0] - 1) ** 2 + (x[1] + 2) ** 2, new Float64Array(2))
 */
export function minimizeNelderMead(
  objective: (x: Float64Array) => number,
  start: Float64Array,
  options: NelderMeadOptions = {},
): LocalMinimum {
  const n = start.length;
  const maxEvaluations = options.maxEvaluations ?? 400 * Math.max(1, n);
  const valueTolerance = options.valueTolerance ?? 1e-10;
  const sizeTolerance = options.sizeTolerance ?? 1e-8;
  const reflect = 1;
  const expand = n >= 2 ? 1 + 2 / n : 2;
  const contract = n >= 2 ? 0.75 - 1 / (2 * n) : 0.5;
  const shrink = n >= 2 ? 1 - 1 / n : 0.5;
  let evaluations = 0;
  const f = (x: Float64Array): number => {
    evaluations++;
    const v = objective(x);
    return Number.isNaN(v) ? Infinity : v;
  };

  const vertices: Float64Array[] = [Float64Array.from(start)];
  for (let i = 0; i < n; i++) {
    const v = Float64Array.from(start);
    const step = options.initialStep;
    const h = step === undefined ? 0.1 + 0.05 * Math.abs(start[i]) : typeof step === "number" ? step : step[i];
    v[i] = v[i] + h;
    vertices.push(v);
  }
  const values = vertices.map(f);
  if (!Number.isFinite(values[0])) {
    throw new RangeError(`Nelder-Mead: objective is not finite at the starting point (${values[0]})`);
  }
  const order = Array.from({ length: n + 1 }, (_, i) => i);
  const centroid = new Float64Array(n);
  const point = (base: Float64Array, towards: Float64Array, t: number): Float64Array => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = base[i] + t * (towards[i] - base[i]);
    return out;
  };

  let iterations = 0;
  let converged = false;
  while (evaluations < maxEvaluations) {
    order.sort((a, b) => values[a] - values[b]);
    const best = order[0];
    const worst = order[n];
    const secondWorst = order[n - 1] ?? best;
    let spread = 0;
    let size = 0;
    for (let j = 1; j <= n; j++) {
      spread = Math.max(spread, Math.abs(values[order[j]] - values[best]));
      for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(vertices[order[j]][i] - vertices[best][i]));
    }
    if (spread <= valueTolerance * Math.max(1, Math.abs(values[best])) && size <= sizeTolerance) {
      converged = true;
      break;
    }
    iterations++;
    centroid.fill(0);
    for (let j = 0; j < n; j++) {
      const v = vertices[order[j]];
      for (let i = 0; i < n; i++) centroid[i] = centroid[i] + v[i] / n;
    }
    const xr = point(centroid, vertices[worst], -reflect);
    const fr = f(xr);
    if (fr < values[best]) {
      const xe = point(centroid, xr, expand);
      const fe = f(xe);
      if (fe < fr) {
        vertices[worst] = xe;
        values[worst] = fe;
      } else {
        vertices[worst] = xr;
        values[worst] = fr;
      }
      continue;
    }
    if (fr < values[secondWorst]) {
      vertices[worst] = xr;
      values[worst] = fr;
      continue;
    }
    if (fr < values[worst]) {
      const xc = point(centroid, xr, contract);
      const fc = f(xc);
      if (fc <= fr) {
        vertices[worst] = xc;
        values[worst] = fc;
        continue;
      }
    } else {
      const xc = point(centroid, vertices[worst], contract);
      const fc = f(xc);
      if (fc < values[worst]) {
        vertices[worst] = xc;
        values[worst] = fc;
        continue;
      }
    }
    const anchor = vertices[best];
    for (let j = 1; j <= n; j++) {
      const idx = order[j];
      vertices[idx] = point(anchor, vertices[idx], shrink);
      values[idx] = f(vertices[idx]);
    }
  }
  let bestIndex = 0;
  for (let j = 1; j <= n; j++) if (values[j] < values[bestIndex]) bestIndex = j;
  return {
    x: vertices[bestIndex],
    value: values[bestIndex],
    iterations,
    evaluations,
    converged,
    stop: converged ? "value" : "evaluations",
  };
}
