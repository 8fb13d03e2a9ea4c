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

function supNorm(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** The correction pairs s = x_new - x, y = g_new - g (with rho = 1 / s.y) the inverse-Hessian approximation is built from. */
interface CorrectionPairs {
  readonly s: Float64Array[];
  readonly y: Float64Array[];
  readonly rho: number[];
}

/** Forgets every pair (a restart from steepest descent). */
function clearPairs(pairs: CorrectionPairs): void {
  pairs.s.length = 0;
  pairs.y.length = 0;
  pairs.rho.length = 0;
}

/**
 * Keeps a new pair, dropping the oldest beyond `memory`, when its curvature s.y is positive (only such
 * pairs keep the inverse-Hessian approximation positive definite).
 */
function rememberPair(pairs: CorrectionPairs, s: Float64Array, y: Float64Array, memory: number): void {
  const sy = dot(s, y);
  if (!(sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y)))) return;
  if (pairs.s.length === memory) {
    pairs.s.shift();
    pairs.y.shift();
    pairs.rho.shift();
  }
  pairs.s.push(s);
  pairs.y.push(y);
  pairs.rho.push(1 / sy);
}

/**
 * Stage 1, the two-loop recursion (Nocedal & Wright 2006, algorithm 7.4): writes direction = -H g with H
 * the L-BFGS inverse-Hessian approximation of the pairs, and returns its slope g.direction. A direction
 * that does not descend (stale curvature) is replaced by steepest descent and the pairs are forgotten.
 */
function searchDirection(g: Float64Array, pairs: CorrectionPairs, direction: Float64Array, alphas: Float64Array): number {
  const n = g.length;
  for (let i = 0; i < n; i++) direction[i] = -g[i];
  const k = pairs.s.length;
  for (let j = k - 1; j >= 0; j--) {
    const a = pairs.rho[j] * dot(pairs.s[j], direction);
    alphas[j] = a;
    const y = pairs.y[j];
    for (let i = 0; i < n; i++) direction[i] = direction[i] - a * y[i];
  }
  if (k > 0) {
    const gamma = dot(pairs.s[k - 1], pairs.y[k - 1]) / dot(pairs.y[k - 1], pairs.y[k - 1]);
    for (let i = 0; i < n; i++) direction[i] = direction[i] * gamma;
  }
  for (let j = 0; j < k; j++) {
    const b = pairs.rho[j] * dot(pairs.y[j], direction);
    const s = pairs.s[j];
    const coef = alphas[j] - b;
    for (let i = 0; i < n; i++) direction[i] = direction[i] + coef * s[i];
  }
  const slope = dot(g, direction);
  if (slope < 0) return slope;
  clearPairs(pairs);
  for (let i = 0; i < n; i++) direction[i] = -g[i];
  return dot(g, direction);
}

/** Sufficient-decrease (Armijo) constant of the strong Wolfe conditions. */
const WOLFE_C1 = 1e-4;
/** Curvature constant of the strong Wolfe conditions. */
const WOLFE_C2 = 0.9;

/**
 * One line search along `direction` from `x`: the objective with its evaluation count and limit, the
 * value and slope at the origin, the trial buffers, and the best acceptable point found so far (with a
 * copy of its gradient).
 */
interface LineSearch {
  readonly objective: GradientObjective;
  readonly x: Float64Array;
  readonly direction: Float64Array;
  readonly origin: LinePoint;
  readonly trialX: Float64Array;
  readonly trialG: Float64Array;
  readonly maxEvaluations: number;
  evaluations: number;
  accepted: LinePoint | null;
  acceptedG: Float64Array | null;
}

/** The objective at x + alpha direction, its slope along the direction (gradient left in trialG); a non-finite value counts as +Infinity. */
function evaluateAlong(search: LineSearch, alpha: number): LinePoint {
  const { x, direction, trialX, trialG } = search;
  for (let i = 0; i < x.length; i++) trialX[i] = x[i] + alpha * direction[i];
  const value = search.objective(trialX, trialG);
  search.evaluations++;
  if (!Number.isFinite(value)) return { alpha, value: Infinity, slope: NaN };
  return { alpha, value, slope: dot(trialG, direction) };
}

function sufficientDecrease(search: LineSearch, p: LinePoint): boolean {
  return p.value <= search.origin.value + WOLFE_C1 * p.alpha * search.origin.slope;
}

function curvatureHolds(search: LineSearch, p: LinePoint): boolean {
  return Math.abs(p.slope) <= -WOLFE_C2 * search.origin.slope;
}

/** Remembers `p` (the point last evaluated, its gradient in trialG) as the step to take. */
function accept(search: LineSearch, p: LinePoint): void {
  search.accepted = p;
  search.acceptedG = Float64Array.from(search.trialG);
}

/**
 * Stage 3, the zoom (Nocedal & Wright 2006, algorithm 3.6): narrows the bracket [low, high] by safeguarded
 * cubic interpolation (bisection when the cubic's minimiser falls outside the middle 80%) until a point
 * meets both Wolfe conditions, keeping the best sufficient-decrease point in case the bracket collapses.
 */
function zoom(search: LineSearch, lowIn: LinePoint, highIn: LinePoint): void {
  let low = lowIn;
  let high = highIn;
  for (let tries = 0; tries < 30 && search.evaluations < search.maxEvaluations; tries++) {
    const width = high.alpha - low.alpha;
    let a = Number.isFinite(high.value) ? cubicMinimizer(low, high) : NaN;
    const lo = Math.min(low.alpha, high.alpha) + 0.1 * Math.abs(width);
    const hi = Math.max(low.alpha, high.alpha) - 0.1 * Math.abs(width);
    if (!(a >= lo && a <= hi)) a = low.alpha + 0.5 * width;
    const p = evaluateAlong(search, a);
    if (!sufficientDecrease(search, p) || p.value >= low.value) {
      high = p;
    } else {
      accept(search, p);
      if (curvatureHolds(search, p)) return;
      if (p.slope * width >= 0) high = low;
      low = p;
    }
    if (Math.abs(high.alpha - low.alpha) < 1e-16 * Math.max(1, Math.abs(low.alpha))) return;
  }
}

/**
 * Stage 2, the bracketing phase of the strong Wolfe line search (Nocedal & Wright 2006, algorithm 3.5):
 * doubles the step from `initialAlpha` until a point meets both conditions or a bracket for `zoom`
 * is found; leaves the step to take in `search.accepted` (null when none lowered the objective enough).
 */
function strongWolfeSearch(search: LineSearch, initialAlpha: number): void {
  let alpha = initialAlpha;
  let previous = search.origin;
  for (let tries = 0; tries < 40 && search.evaluations < search.maxEvaluations; tries++) {
    const p = evaluateAlong(search, alpha);
    if (!sufficientDecrease(search, p) || (tries > 0 && p.value >= previous.value)) {
      zoom(search, previous, p);
      return;
    }
    accept(search, p);
    if (curvatureHolds(search, p)) return;
    if (p.slope >= 0) {
      zoom(search, p, previous);
      return;
    }
    previous = p;
    alpha *= 2;
  }
}

/**
 * Stage 4, the convergence tests after a step from value `previousF` to `f` at `x` with gradient `g` and step
 * `s`: the stop it meets, or undefined to go on.
 */
function convergenceStop(
  previousF: number,
  f: number,
  x: Float64Array,
  g: Float64Array,
  s: Float64Array,
  gradientTolerance: number,
  valueTolerance: number,
): MinimizationStop | undefined {
  if (supNorm(g) <= gradientTolerance) return "gradient";
  if (previousF - f <= valueTolerance * Math.max(1, Math.abs(f))) return "value";
  if (supNorm(s) <= 1e-14 * Math.max(1, supNorm(x))) return "step";
  return undefined;
}

/**
 * Limited-memory BFGS with the two-loop recursion and a line search that enforces the strong Wolfe
 * conditions with c1 = 1e-4, c2 = 0.9 (Nocedal & Wright 2006, Numerical Optimization, 2nd ed.,
 * algorithms 7.4, 7.5, 3.5 and 3.6). Points where f is not finite are treated as too far and the step
 * is shortened, so a log posterior that is -Infinity outside its support can be minimised as -ln p.
 * Each iteration: the search direction (`searchDirection`), the line search
 * (`strongWolfeSearch` with `zoom`), the step and its correction pair (`rememberPair`),
 * the convergence tests (`convergenceStop`).
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

  let x: Float64Array = Float64Array.from(start);
  let g: Float64Array = new Float64Array(n);
  let f = objective(x, g);
  let evaluations = 1;
  if (!Number.isFinite(f)) throw new RangeError(`L-BFGS: objective is not finite at the starting point (${f})`);

  const pairs: CorrectionPairs = { s: [], y: [], rho: [] };
  const direction = new Float64Array(n);
  const alphas = new Float64Array(memory);
  const trialX = new Float64Array(n);
  let trialG: Float64Array = new Float64Array(n);

  let iterations = 0;
  let stop: MinimizationStop = "iterations";
  let converged = false;
  if (supNorm(g) <= gradientTolerance) {
    return { x, value: f, iterations, evaluations, converged: true, stop: "gradient" };
  }

  while (iterations < maxIterations) {
    const firstStep = pairs.s.length === 0;
    const slope0 = searchDirection(g, pairs, direction, alphas);
    const search: LineSearch = {
      objective,
      x,
      direction,
      origin: { alpha: 0, value: f, slope: slope0 },
      trialX,
      trialG,
      maxEvaluations,
      evaluations,
      accepted: null,
      acceptedG: null,
    };
    strongWolfeSearch(search, firstStep ? Math.min(1, 1 / Math.max(supNorm(g), 1e-300)) : 1);
    evaluations = search.evaluations;
    const step = search.accepted;
    const newG = search.acceptedG;
    if (step === null || newG === null || !(step.value < f)) {
      stop = evaluations >= maxEvaluations ? "evaluations" : "line-search";
      converged = supNorm(g) <= Math.sqrt(gradientTolerance);
      break;
    }

    iterations++;
    const s = new Float64Array(n);
    const y = new Float64Array(n);
    const newX = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      newX[i] = x[i] + step.alpha * direction[i];
      s[i] = newX[i] - x[i];
      y[i] = newG[i] - g[i];
    }
    const previousF = f;
    x = newX;
    trialG = g;
    g = newG;
    f = step.value;
    rememberPair(pairs, s, y, memory);
    const reached = convergenceStop(previousF, f, x, g, s, gradientTolerance, valueTolerance);
    if (reached !== undefined) {
      stop = reached;
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
