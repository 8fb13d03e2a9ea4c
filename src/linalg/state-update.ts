import type { TransitionLayout } from "./transition-layout.js";

/**
 * The forward step that every typed-array pass of the semiseparable recursion shares (the general
 * likelihood loop and with it the gradient's forward pass, the factorisation, the smoother): {@link stepState}
 * from one point to the next, then {@link projectState} onto the observation. The written-out code of
 * `recursion-source.ts` performs the same operations in the same order on local variables.
 */

/**
 * From point k - 1 to point k: absorb point k - 1 (when `absorb`; u, 1 / D, z of that point), then
 * S <- Phi S Phi^T and f <- Phi f over the lag dt. `transitions` fills `layout.phi` for the lag (by
 * default `layout.computeTransitions`; the gradient's forward pass records them on its tape as well).
 */
export function stepState(
  layout: TransitionLayout,
  s: Float64Array,
  f: Float64Array,
  gains: Float64Array,
  gainOffset: number,
  inversePivot: number,
  innovation: number,
  dt: number,
  absorb: boolean,
  transitions?: (dt: number) => void,
): void {
  if (absorb) absorbPoint(s, f, gains, gainOffset, inversePivot, innovation, layout.dimension);
  if (transitions) transitions(dt);
  else layout.computeTransitions(dt);
  layout.applyCongruence(s, 0);
  layout.applyToVector(f, 0);
}

/**
 * Adds a conditioned point's information to the explained covariance and the predicted state:
 * S <- S + u u^T / D and f <- f + u z / D, with u = gains[offset ... offset + R), `inversePivot` = 1 / D.
 */
export function absorbPoint(
  s: Float64Array,
  f: Float64Array,
  gains: Float64Array,
  offset: number,
  inversePivot: number,
  innovation: number,
  r: number,
): void {
  for (let i = 0; i < r; i++) {
    const ui = gains[offset + i] * inversePivot;
    for (let j = 0; j < r; j++) s[i * r + j] += ui * gains[offset + j];
    f[i] += ui * innovation;
  }
}

/**
 * Projects the state onto the observation: writes u = q - S p into gains[offset ...] and returns
 * [p^T S p, p^T f] in `out`.
 */
export function projectState(
  s: Float64Array,
  f: Float64Array,
  p: Float64Array,
  q: Float64Array,
  gains: Float64Array,
  offset: number,
  r: number,
  out: Float64Array,
): void {
  // Every sum starts from its first term, not from 0 + term: the same value (up to the sign of a zero),
  // one addition fewer on the recursion's critical path (D_k waits on p^T S_k p).
  let pSp = 0;
  let pf = 0;
  for (let i = 0; i < r; i++) {
    let sp = s[i * r] * p[0];
    for (let j = 1; j < r; j++) sp += s[i * r + j] * p[j];
    gains[offset + i] = q[i] - sp;
    if (i === 0) {
      pSp = p[0] * sp;
      pf = p[0] * f[0];
    } else {
      pSp += p[i] * sp;
      pf += p[i] * f[i];
    }
  }
  out[0] = pSp;
  out[1] = pf;
}
