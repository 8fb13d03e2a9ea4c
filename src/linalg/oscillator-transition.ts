import type { ParameterDependence, TransitionBlock } from "./transition-block.js";

/**
 * The two-dimensional block of a stochastically driven damped harmonic oscillator,
 * x'' + (w0 / Q) x' + w0^2 x = noise, in the scaled state (x, x' / w0):
 *
 *     F = [[0, w0], [-w0, -w0 / Q]].
 *
 * Writing c = w0 / (2Q) and G = F + c I (so that G^2 = lambda I with lambda = c^2 - w0^2), the transition is
 *
 *     exp(F dt) = exp(-c dt) [C(dt) I + S(dt) G],   C = cosh(sqrt(lambda) dt),  S = sinh(sqrt(lambda) dt) / sqrt(lambda),
 *
 * which is cos / sin for Q > 1/2 (lambda < 0), cosh / sinh for Q < 1/2 and 1 / dt at Q = 1/2. C and S are
 * entire functions of lambda; near lambda dt^2 = 0 they are summed as power series, so every quality factor,
 * including Q within 1e-8 of 1/2 and Q = 1/2 exactly, is evaluated without cancellation. In the overdamped
 * regime the two real rates c -/+ sqrt(lambda) are formed as w0^2 / (c + sqrt(lambda)) and c + sqrt(lambda)
 * so that nothing overflows or cancels.
 *
 * Native parameters: w0 (angular frequency, rad per time unit) and Q (quality factor).
 */
export class OscillatorTransition implements TransitionBlock {
  readonly size = 2;
  readonly generator: Float64Array;
  readonly parameterIndex: Int32Array;
  private readonly halfWidth: number; // c = w0 / (2Q)
  private readonly lambda: number; // c^2 - w0^2
  private readonly scratch = new Float64Array(4);

  /**
   * @param w0 undamped angular frequency (> 0)
   * @param quality quality factor Q (> 0)
   * @param dependencies how kernel parameters move (w0, Q): derivatives = [dw0/dtheta, dQ/dtheta]
   */
  constructor(
    readonly w0: number,
    readonly quality: number,
    private readonly dependencies: readonly ParameterDependence[],
  ) {
    this.halfWidth = w0 / (2 * quality);
    this.lambda = w0 * w0 * (1 / (4 * quality * quality) - 1);
    this.generator = Float64Array.of(0, w0, -w0, -w0 / quality);
    this.parameterIndex = Int32Array.from(dependencies.map((d) => d.index));
  }

  transition(dt: number, out: Float64Array, offset: number): void {
    const f = this.scratch;
    dampedHyperbolicPair(this.halfWidth, this.lambda, this.w0, dt, f);
    const ec = f[0];
    const es = f[1];
    const c = this.halfWidth;
    const w0 = this.w0;
    out[offset] = ec + es * c;
    out[offset + 1] = es * w0;
    out[offset + 2] = -es * w0;
    out[offset + 3] = ec - es * c;
  }

  transitionDerivatives(dt: number, out: Float64Array, offset: number): void {
    const f = this.scratch;
    dampedHyperbolicPair(this.halfWidth, this.lambda, this.w0, dt, f);
    const [ec, es, ecl, esl] = f;
    const c = this.halfWidth;
    const w0 = this.w0;
    const q = this.quality;
    // Phi = E (C I + S G), G = [[c, w0], [-w0, -c]], lambda = c^2 - w0^2, E = exp(-c dt).
    // Partial derivatives with c and w0 treated as independent:
    const phi00 = ec + es * c;
    const phi01 = es * w0;
    const phi11 = ec - es * c;
    // d/dc: -dt Phi + E (dC I + dS G) with d lambda = 2c, plus E S dG/dc (dG/dc = diag(1, -1)).
    const dc00 = -dt * phi00 + 2 * c * (ecl + esl * c) + es;
    const dc01 = -dt * phi01 + 2 * c * esl * w0;
    const dc11 = -dt * phi11 + 2 * c * (ecl - esl * c) - es;
    // d/dw0 (c fixed): d lambda = -2 w0, dG/dw0 = [[0, 1], [-1, 0]].
    const dw00 = -2 * w0 * (ecl + esl * c);
    const dw01 = -2 * w0 * esl * w0 + es;
    const dw11 = -2 * w0 * (ecl - esl * c);
    for (let k = 0; k < this.dependencies.length; k++) {
      const [dW0, dQ] = this.dependencies[k].derivatives;
      // c = w0 / (2Q): dc = dw0 / (2Q) - w0 dQ / (2 Q^2)
      const dC = dW0 / (2 * q) - (w0 * dQ) / (2 * q * q);
      const base = offset + 4 * k;
      out[base] = dc00 * dC + dw00 * dW0;
      out[base + 1] = dc01 * dC + dw01 * dW0;
      out[base + 2] = -out[base + 1];
      out[base + 3] = dc11 * dC + dw11 * dW0;
    }
  }

  reindexed(map: (index: number) => number): TransitionBlock {
    return new OscillatorTransition(
      this.w0,
      this.quality,
      this.dependencies.map((d) => ({ index: map(d.index), derivatives: d.derivatives })),
    );
  }
}

/**
 * Writes [E C, E S, E dC/dlambda, E dS/dlambda] for E = exp(-c dt), C = cosh(sqrt(lambda) dt),
 * S = sinh(sqrt(lambda) dt) / sqrt(lambda), with lambda = c^2 - w0^2 (any sign), into out[0..3].
 * dC/dlambda = dt S / 2 and dS/dlambda = (dt C - S) / (2 lambda) (power series near lambda dt^2 = 0).
 */
export function dampedHyperbolicPair(c: number, lambda: number, w0: number, dt: number, out: Float64Array): void {
  const x = lambda * dt * dt;
  if (Math.abs(x) < 1) {
    // C = sum x^k / (2k)!, S = dt sum x^k / (2k+1)!, dS/dlambda = dt^3 sum (k+1) x^k / (2k+3)!
    let cSum = 1;
    let sSum = 1;
    let dsSum = 1 / 6;
    let cTerm = 1;
    let sTerm = 1;
    let dsTerm = 1 / 6;
    // |x| < 1: the terms fall at least factorially; stop once they no longer change the sums.
    for (let k = 1; k < 12; k++) {
      cTerm *= x / ((2 * k - 1) * (2 * k));
      sTerm *= x / ((2 * k) * (2 * k + 1));
      dsTerm *= x / ((2 * k + 2) * (2 * k + 3));
      cSum += cTerm;
      sSum += sTerm;
      dsSum += (k + 1) * dsTerm;
      if (Math.abs(cTerm) < 1e-17 && Math.abs(dsTerm) < 1e-18) break;
    }
    const e = Math.exp(-c * dt);
    const s = dt * sSum;
    out[0] = e * cSum;
    out[1] = e * s;
    out[2] = 0.5 * dt * out[1];
    out[3] = e * dt * dt * dt * dsSum;
    return;
  }
  if (lambda < 0) {
    const omega = Math.sqrt(-lambda);
    const e = Math.exp(-c * dt);
    const cosine = Math.cos(omega * dt);
    const sine = Math.sin(omega * dt) / omega;
    out[0] = e * cosine;
    out[1] = e * sine;
  } else {
    const root = Math.sqrt(lambda);
    const fastRate = c + root;
    const slowRate = (w0 * w0) / fastRate; // c - root without cancellation
    const slow = Math.exp(-slowRate * dt);
    const fast = Math.exp(-fastRate * dt);
    out[0] = 0.5 * (slow + fast);
    out[1] = (slow - fast) / (2 * root);
  }
  out[2] = 0.5 * dt * out[1];
  out[3] = (dt * out[0] - out[1]) / (2 * lambda);
}
