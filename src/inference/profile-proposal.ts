import type { Rng } from "../random/rng.js";
import { studentTLogPdf } from "./distribution-functions.js";
import type { PosteriorTarget } from "./posterior-target.js";

/** An importance-sampling proposal: normalised ln density, and draws. */
export interface ImportanceProposal {
  /** Writes a draw into `out` and returns its ln q. */
  draw(rng: Rng, out: Float64Array): number;
  /** ln q(x), normalised. */
  logDensity(x: Float64Array): number;
}

/** Options of {@link profileProposal}. */
export interface ProfileProposalOptions {
  /** The coordinate to lay the grid along (default 0: models list their timescale or period first). */
  readonly coordinate?: number;
  /** How far below its highest value the profile is followed, in ln density (default 12). */
  readonly depth?: number;
  /** Most grid nodes on each side of the mode (default 40). */
  readonly maxNodesPerSide?: number;
  /** Degrees of freedom of the conditional Student-t (default 5). */
  readonly degreesOfFreedom?: number;
  /** Factor on the conditional standard deviation (default 1.2, a little wider than the curvature says). */
  readonly widening?: number;
}

/** Grid of the profile: node positions, conditional modes and scales, ln marginal approximations. */
export interface ProfileGrid {
  readonly nodes: Float64Array;
  readonly conditionalMode: Float64Array;
  readonly conditionalScale: Float64Array;
  readonly logMarginal: Float64Array;
  /** Target evaluations the grid cost. */
  readonly evaluations: number;
}

/**
 * A proposal for two-dimensional posteriors that follows a curved ridge, built along one coordinate
 * (call it a, the other b): on a grid of a, the conditional mode m(a) and curvature s(a)^-2 of ln p(a, b)
 * in b (Newton steps on central differences), and the Laplace approximation of the marginal,
 * ln p(a) ~ ln p(a, m(a)) + ln s(a) (Tierney & Kadane 1986, J. Am. Stat. Assoc. 81, 82; the same
 * construction as the nested Laplace approximations of Rue, Martino & Chopin 2009, JRSS B 71, 319).
 * The proposal is q(a, b) = q(a) t_nu(b; m(a), w s(a)), with ln q(a) linear between nodes (a piecewise
 * exponential density, sampled exactly), exponential tails beyond the last nodes, and m, s linear
 * between nodes. The grid steps out from the mode until the approximate marginal has fallen `depth`
 * below its highest value, so it follows a ridge for as long as the ridge carries probability.
 *
 * Why: the damped random walk's posterior in (tau, sigma) is a long, thin, curved ridge when the
 * timescale is poorly constrained (the likelihood depends on sigma^2 / tau alone for tau >> baseline);
 * no single Student-t covers it (importance weights with k-hat > 1), while conditionally on tau the
 * amplitude is nearly Gaussian.
 *
 * Returns undefined when the density is not curved downwards in b at the mode.
 */
export function profileProposal(
  target: PosteriorTarget,
  mode: Float64Array,
  marginalScale: number,
  conditionalScale: number,
  options: ProfileProposalOptions = {},
): { proposal: ImportanceProposal; grid: ProfileGrid } | undefined {
  if (target.dimension !== 2) throw new RangeError(`profile proposal: needs a two-dimensional target, got ${target.dimension}`);
  const a = options.coordinate ?? 0;
  const b = 1 - a;
  const depth = options.depth ?? 12;
  const maxNodes = options.maxNodesPerSide ?? 40;
  const nu = options.degreesOfFreedom ?? 5;
  const widening = options.widening ?? 1.2;
  const point = new Float64Array(2);
  let evaluations = 0;
  const at = (ua: number, ub: number) => {
    point[a] = ua;
    point[b] = ub;
    evaluations++;
    const v = target.logPosterior(point);
    return Number.isNaN(v) ? -Infinity : v;
  };

  /** Conditional mode and scale of b at a = ua, by Newton steps from (start, scale). */
  const conditional = (ua: number, start: number, scale: number): { mode: number; scale: number; value: number } | undefined => {
    let x = start;
    let s = scale;
    for (let iteration = 0; iteration < 6; iteration++) {
      const h = 0.5 * s;
      const f0 = at(ua, x);
      const fp = at(ua, x + h);
      const fm = at(ua, x - h);
      if (!Number.isFinite(f0) && !Number.isFinite(fp) && !Number.isFinite(fm)) return undefined;
      const second = (fp - 2 * f0 + fm) / (h * h);
      const first = (fp - fm) / (2 * h);
      if (!(second < 0) || !Number.isFinite(second)) {
        // Not curved downwards here: move uphill by one scale and try again.
        x += fp > fm ? s : -s;
        continue;
      }
      s = 1 / Math.sqrt(-second);
      const step = Math.max(-3 * s, Math.min(3 * s, -first / second));
      x += step;
      if (Math.abs(step) < 0.1 * s) return { mode: x, scale: s, value: at(ua, x) };
    }
    const value = at(ua, x);
    return Number.isFinite(value) ? { mode: x, scale: s, value } : undefined;
  };

  const centre = conditional(mode[a], mode[b], conditionalScale);
  if (centre === undefined) return undefined;
  const nodes: { u: number; mode: number; scale: number; logMarginal: number }[] = [
    { u: mode[a], mode: centre.mode, scale: centre.scale, logMarginal: centre.value + Math.log(centre.scale) },
  ];
  let highest = nodes[0].logMarginal;
  for (const direction of [1, -1]) {
    let step = 0.5 * marginalScale;
    let previous = nodes[0];
    for (let k = 0; k < maxNodes; k++) {
      const u = previous.u + direction * step;
      const next = conditional(u, previous.mode, previous.scale);
      if (next === undefined || !Number.isFinite(next.value)) break;
      const node = { u, mode: next.mode, scale: next.scale, logMarginal: next.value + Math.log(next.scale) };
      if (direction > 0) nodes.push(node);
      else nodes.unshift(node);
      highest = Math.max(highest, node.logMarginal);
      if (node.logMarginal < highest - depth) break;
      // Lengthen the step where the marginal changes slowly (a flat ridge), shorten it where it falls fast.
      const change = Math.abs(node.logMarginal - previous.logMarginal);
      if (change < 0.5) step *= 1.5;
      else if (change > 2) step *= 0.6;
      previous = node;
    }
  }
  const grid: ProfileGrid = {
    nodes: Float64Array.from(nodes, (n) => n.u),
    conditionalMode: Float64Array.from(nodes, (n) => n.mode),
    conditionalScale: Float64Array.from(nodes, (n) => widening * n.scale),
    logMarginal: Float64Array.from(nodes, (n) => n.logMarginal - highest),
    evaluations,
  };
  return { proposal: proposalFromGrid(grid, a, nu, marginalScale), grid };
}

/** The proposal of {@link profileProposal} from its grid. */
function proposalFromGrid(grid: ProfileGrid, a: number, nu: number, marginalScale: number): ImportanceProposal {
  const b = 1 - a;
  const { nodes, conditionalMode, conditionalScale, logMarginal: ell } = grid;
  const n = nodes.length;
  // Exponential tails beyond the ends, decaying at least as fast as over one marginal scale.
  const leftRate = Math.max(1 / marginalScale, n > 1 ? (ell[1] - ell[0]) / (nodes[1] - nodes[0]) : 0);
  const rightRate = Math.max(1 / marginalScale, n > 1 ? (ell[n - 2] - ell[n - 1]) / (nodes[n - 1] - nodes[n - 2]) : 0);
  // Mass of each piece (left tail, segments, right tail), relative to exp(highest ell) = 1.
  const pieces = new Float64Array(n + 1);
  pieces[0] = Math.exp(ell[0]) / leftRate;
  for (let j = 0; j + 1 < n; j++) pieces[j + 1] = segmentMass(nodes[j], nodes[j + 1], ell[j], ell[j + 1]);
  pieces[n] = Math.exp(ell[n - 1]) / rightRate;
  let total = 0;
  for (const m of pieces) total += m;
  const logTotal = Math.log(total);
  const cumulative = new Float64Array(n + 1);
  let running = 0;
  pieces.forEach((m, j) => {
    running += m / total;
    cumulative[j] = running;
  });

  /** Index j of the segment [nodes[j], nodes[j+1]] holding u, -1 left of the grid, n - 1 right of it. */
  const segmentOf = (u: number): number => {
    if (u < nodes[0]) return -1;
    if (u >= nodes[n - 1]) return n - 1;
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (nodes[mid] <= u) lo = mid;
      else hi = mid;
    }
    return lo;
  };
  const marginalLogDensity = (u: number, j: number): number => {
    if (j < 0) return ell[0] - leftRate * (nodes[0] - u) - logTotal;
    if (j >= n - 1) return ell[n - 1] - rightRate * (u - nodes[n - 1]) - logTotal;
    const f = (u - nodes[j]) / (nodes[j + 1] - nodes[j]);
    return ell[j] + f * (ell[j + 1] - ell[j]) - logTotal;
  };
  const conditionalAt = (u: number, j: number): [number, number] => {
    if (j < 0) return [conditionalMode[0], conditionalScale[0]];
    if (j >= n - 1) return [conditionalMode[n - 1], conditionalScale[n - 1]];
    const f = (u - nodes[j]) / (nodes[j + 1] - nodes[j]);
    return [conditionalMode[j] + f * (conditionalMode[j + 1] - conditionalMode[j]), conditionalScale[j] + f * (conditionalScale[j + 1] - conditionalScale[j])];
  };
  const logDensity = (x: Float64Array): number => {
    const u = x[a];
    const j = segmentOf(u);
    const [m, s] = conditionalAt(u, j);
    return marginalLogDensity(u, j) + studentTLogPdf((x[b] - m) / s, nu) - Math.log(s);
  };
  return {
    logDensity,
    draw(rng: Rng, out: Float64Array): number {
      const v = rng.uniform();
      let piece = 0;
      while (piece < n && cumulative[piece] < v) piece++;
      let u: number;
      const w = rng.uniform();
      if (piece === 0) u = nodes[0] + Math.log1p(-w) / leftRate;
      else if (piece === n) u = nodes[n - 1] - Math.log1p(-w) / rightRate;
      else u = sampleSegment(nodes[piece - 1], nodes[piece], ell[piece - 1], ell[piece], w);
      const [m, s] = conditionalAt(u, segmentOf(u));
      // A t draw: normal over the root of a chi-square over nu.
      let chiSquare = 0;
      for (let k = 0; k < nu; k++) {
        const g = rng.normal();
        chiSquare += g * g;
      }
      out[a] = u;
      out[b] = m + s * rng.normal() * Math.sqrt(nu / chiSquare);
      return logDensity(out);
    },
  };
}

/** Integral of exp(l0 + (l1 - l0)(u - u0)/(u1 - u0)) over [u0, u1]. */
function segmentMass(u0: number, u1: number, l0: number, l1: number): number {
  const width = u1 - u0;
  const rise = l1 - l0;
  if (Math.abs(rise) < 1e-9) return width * Math.exp(0.5 * (l0 + l1));
  return (width * (Math.exp(l1) - Math.exp(l0))) / rise;
}

/** The inverse CDF of the density exp(linear) on [u0, u1] at w in [0, 1). */
function sampleSegment(u0: number, u1: number, l0: number, l1: number, w: number): number {
  const width = u1 - u0;
  const rise = l1 - l0;
  if (Math.abs(rise) < 1e-9) return u0 + w * width;
  // u = u0 + width ln(1 + w (e^rise - 1)) / rise, written to keep precision for either sign of rise.
  return u0 + (width * Math.log1p(w * Math.expm1(rise))) / rise;
}
