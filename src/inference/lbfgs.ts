/** An objective with its gradient: returns f(x) and writes df/dx into `gradientOut`. */
export type GradientObjective = (x: Float64Array, gradientOut: Float64Array) => number;

/** Why a local minimisation stopped. */
export type MinimizationStop = "gradient" | "value" | "step" | "iterations" | "line-search" | "evaluations";

/** The outcome of a local minimisation. */
export interface LocalMinimum {
  /** Best point found. */
  readonly x: Float64Array;
  /** Objective at `x`. */
  readonly value: number;
  readonly iterations: number;
  /** Objective evaluations used (for L-BFGS each one includes the gradient). */
  readonly evaluations: number;
  /** True when a convergence test was met (not just a limit hit). */
  readonly converged: boolean;
  readonly stop: MinimizationStop;
}

/** Options of {@link minimizeLbfgs}. */
export interface LbfgsOptions {
  /** Number of correction pairs kept (default 8). */
  readonly memory?: number;
  /** Iteration limit (default 500). */
  readonly maxIterations?: number;
  /** Evaluation limit (default 20 * maxIterations). */
  readonly maxEvaluations?: number;
  /** Stop when max_i |df/dx_i| <= gradientTolerance (default 1e-6). */
  readonly gradientTolerance?: number;
  /** Stop when an iteration lowers f by less than valueTolerance * max(1, |f|) (default 1e-12). */
  readonly valueTolerance?: number;
}

interface LinePoint {
  alpha: number;
  value: number;
  slope: number;
}

/**
 * Minimiser of the cubic through two points with values and slopes (Nocedal & Wright 2006,
 * Numerical Optimization, 2nd ed., eq. 3.59); NaN when the cubic has no minimiser.
 */
function cubicMinimizer(a: LinePoint, b: LinePoint): number {
  const d1 = a.slope + b.slope - (3 * (a.value - b.value)) / (a.alpha - b.alpha);
  const disc = d1 * d1 - a.slope * b.slope;
  if (!(disc >= 0)) return NaN;
  const d2 = Math.sign(b.alpha - a.alpha) * Math.sqrt(disc);
  return b.alpha - (b.alpha - a.alpha) * ((b.slope + d2 - d1) / (b.slope - a.slope + 2 * d2));
}

/**
 * Limited-memory BFGS with the two-loop recursion and a line search that enforces the strong Wolfe
 * conditions with c1 = 1e-4, c2 = 0.9 (Nocedal & Wright 2006, Numerical Optimization, 2nd ed.,
 * algorithms 7.4, 7.5, 3.5 and 3.6). Points where f is not finite are treated as too far and the step
 * is shortened, so a log posterior that is -Infinity outside its support can be minimised as -ln p.
 *
 * @example minimizeLbfgs((x, g) => { g[0] = 2 * (x[0] - 3); return (x[0] - 3) ** 2; }, new Float64Array([0]))
 */
export function minimizeLbfgs(
  objective: GradientObjective,
  start: Float64Array,
  options: LbfgsOptions = {},
): LocalMinimum {
  const n = start.length;
  const memory = options.memory ?? 8;
  const maxIterations = options.maxIterations ?? 500;
  const maxEvaluations = options.maxEvaluations ?? 20 * maxIterations;
  const gradientTolerance = options.gradientTolerance ?? 1e-6;
  const valueTolerance = options.valueTolerance ?? 1e-12;
  const c1 = 1e-4;
  const c2 = 0.9;

  let x: Float64Array = Float64Array.from(start);
  let g: Float64Array = new Float64Array(n);
  let f = objective(x, g);
  let evaluations = 1;
  if (!Number.isFinite(f)) throw new RangeError(`L-BFGS: objective is not finite at the starting point (${f})`);

  const sList: Float64Array[] = [];
  const yList: Float64Array[] = [];
  const rhoList: number[] = [];
  const direction = new Float64Array(n);
  const alphas = new Float64Array(memory);
  const trialX = new Float64Array(n);
  let trialG: Float64Array = new Float64Array(n);

  const supNorm = (v: Float64Array): number => {
    let m = 0;
    for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(v[i]!));
    return m;
  };
  const dot = (a: Float64Array, b: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < n; i++) s += a[i]! * b[i]!;
    return s;
  };

  let iterations = 0;
  let stop: MinimizationStop = "iterations";
  let converged = false;
  if (supNorm(g) <= gradientTolerance) {
    return { x, value: f, iterations, evaluations, converged: true, stop: "gradient" };
  }

  while (iterations < maxIterations) {
    // Two-loop recursion: direction = -H g with H the L-BFGS inverse-Hessian approximation.
    for (let i = 0; i < n; i++) direction[i] = -g[i]!;
    const k = sList.length;
    for (let j = k - 1; j >= 0; j--) {
      const a = rhoList[j]! * dot(sList[j]!, direction);
      alphas[j] = a;
      const y = yList[j]!;
      for (let i = 0; i < n; i++) direction[i] = direction[i]! - a * y[i]!;
    }
    if (k > 0) {
      const gamma = dot(sList[k - 1]!, yList[k - 1]!) / dot(yList[k - 1]!, yList[k - 1]!);
      for (let i = 0; i < n; i++) direction[i] = direction[i]! * gamma;
    }
    for (let j = 0; j < k; j++) {
      const b = rhoList[j]! * dot(yList[j]!, direction);
      const s = sList[j]!;
      const coef = alphas[j]! - b;
      for (let i = 0; i < n; i++) direction[i] = direction[i]! + coef * s[i]!;
    }
    let slope0 = dot(g, direction);
    if (!(slope0 < 0)) {
      // Not a descent direction (stale curvature): restart from steepest descent.
      sList.length = 0;
      yList.length = 0;
      rhoList.length = 0;
      for (let i = 0; i < n; i++) direction[i] = -g[i]!;
      slope0 = dot(g, direction);
    }

    // Line search for the strong Wolfe conditions.
    const origin: LinePoint = { alpha: 0, value: f, slope: slope0 };
    const evaluate = (alpha: number): LinePoint => {
      for (let i = 0; i < n; i++) trialX[i] = x[i]! + alpha * direction[i]!;
      const value = objective(trialX, trialG);
      evaluations++;
      if (!Number.isFinite(value)) return { alpha, value: Infinity, slope: NaN };
      return { alpha, value, slope: dot(trialG, direction) };
    };
    const sufficient = (p: LinePoint): boolean => p.value <= f + c1 * p.alpha * slope0;
    const curvature = (p: LinePoint): boolean => Math.abs(p.slope) <= -c2 * slope0;

    let alpha = k === 0 ? Math.min(1, 1 / Math.max(supNorm(g), 1e-300)) : 1;
    let previous = origin;
    let accepted: LinePoint | null = null;
    let acceptedG: Float64Array | null = null;
    const zoom = (lowIn: LinePoint, highIn: LinePoint): void => {
      let low = lowIn;
      let high = highIn;
      for (let tries = 0; tries < 30 && evaluations < maxEvaluations; tries++) {
        const width = high.alpha - low.alpha;
        let a = Number.isFinite(high.value) ? cubicMinimizer(low, high) : NaN;
        const lo = Math.min(low.alpha, high.alpha) + 0.1 * Math.abs(width);
        const hi = Math.max(low.alpha, high.alpha) - 0.1 * Math.abs(width);
        if (!(a >= lo && a <= hi)) a = low.alpha + 0.5 * width;
        const p = evaluate(a);
        if (!sufficient(p) || p.value >= low.value) {
          high = p;
        } else {
          if (curvature(p)) {
            accepted = p;
            acceptedG = Float64Array.from(trialG);
            return;
          }
          if (p.slope * width >= 0) high = low;
          low = p;
          // Keep the best sufficient-decrease point in case the bracket collapses.
          accepted = p;
          acceptedG = Float64Array.from(trialG);
        }
        if (Math.abs(high.alpha - low.alpha) < 1e-16 * Math.max(1, Math.abs(low.alpha))) return;
      }
    };
    for (let tries = 0; tries < 40 && evaluations < maxEvaluations; tries++) {
      const p = evaluate(alpha);
      if (!sufficient(p) || (tries > 0 && p.value >= previous.value)) {
        zoom(previous, p);
        break;
      }
      if (curvature(p)) {
        accepted = p;
        acceptedG = Float64Array.from(trialG);
        break;
      }
      if (p.slope >= 0) {
        accepted = p;
        acceptedG = Float64Array.from(trialG);
        zoom(p, previous);
        break;
      }
      previous = p;
      accepted = p;
      acceptedG = Float64Array.from(trialG);
      alpha *= 2;
    }
    const step = accepted as LinePoint | null;
    if (step === null || acceptedG === null || !(step.value < f)) {
      stop = evaluations >= maxEvaluations ? "evaluations" : "line-search";
      converged = supNorm(g) <= Math.sqrt(gradientTolerance);
      break;
    }

    iterations++;
    const s = new Float64Array(n);
    const y = new Float64Array(n);
    const newX = new Float64Array(n);
    const newG = acceptedG as Float64Array;
    for (let i = 0; i < n; i++) {
      newX[i] = x[i]! + step.alpha * direction[i]!;
      s[i] = newX[i]! - x[i]!;
      y[i] = newG[i]! - g[i]!;
    }
    const sy = dot(s, y);
    const previousF = f;
    x = newX;
    trialG = g;
    g = newG;
    f = step.value;
    // Only pairs with positive curvature keep the inverse-Hessian approximation positive definite.
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) {
      if (sList.length === memory) {
        sList.shift();
        yList.shift();
        rhoList.shift();
      }
      sList.push(s);
      yList.push(y);
      rhoList.push(1 / sy);
    }
    if (supNorm(g) <= gradientTolerance) {
      stop = "gradient";
      converged = true;
      break;
    }
    if (previousF - f <= valueTolerance * Math.max(1, Math.abs(f))) {
      stop = "value";
      converged = true;
      break;
    }
    if (supNorm(s) <= 1e-14 * Math.max(1, supNorm(x))) {
      stop = "step";
      converged = true;
      break;
    }
    if (evaluations >= maxEvaluations) {
      stop = "evaluations";
      break;
    }
  }
  return { x, value: f, iterations, evaluations, converged, stop };
}
