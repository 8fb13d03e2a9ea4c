import { cosineAndSine, decayFactor } from "./elementary-functions.js";
import { compileHelper } from "./emitted-helper.js";
import { literalConstant, type ConstantWriter } from "./generated-constants.js";
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
  /** c = w0 / (2Q), the damping rate of the envelope. */
  readonly halfWidth: number;
  /** lambda = c^2 - w0^2: negative for Q > 1/2 (oscillating), positive for Q < 1/2. */
  readonly lambda: number;
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
    dampedHyperbolicValues(this.halfWidth, this.lambda, this.w0, dt, f);
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

  /**
   * Adds the gradient of a function of (c, w0), taken with c = w0 / (2Q) and w0 independent (`halfWidthBar`,
   * `w0Bar`), to kernelBar for every kernel parameter the block depends on:
   * dc = dw0 / (2Q) - w0 dQ / (2 Q^2).
   */
  addNativeGradient(halfWidthBar: number, w0Bar: number, kernelBar: Float64Array): void {
    const q = this.quality;
    const w0 = this.w0;
    for (const dependence of this.dependencies) {
      const [dW0, dQ] = dependence.derivatives;
      const dC = dW0 / (2 * q) - (w0 * dQ) / (2 * q * q);
      kernelBar[dependence.index] += halfWidthBar * dC + w0Bar * dW0;
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

/** The coefficients 1/(2k)!, k = 0 .. 10, of {@link coshSeries}, as the literals it is written with. */
const COSH_COEFFICIENTS = [
  1, 1 / 2, 1 / 24, 1 / 720, 1 / 40320, 1 / 3628800, 1 / 479001600, 1 / 87178291200, 1 / 20922789888000,
  1 / 6402373705728000, 1 / 2432902008176640000,
];
/** The coefficients 1/(2k + 1)!, k = 0 .. 10, of {@link sinhSeries}. */
const SINH_COEFFICIENTS = [
  1, 1 / 6, 1 / 120, 1 / 5040, 1 / 362880, 1 / 39916800, 1 / 6227020800, 1 / 1307674368000, 1 / 355687428096000,
  1 / 121645100408832000, 1 / 51090942171709440000,
];

/** A Horner expression c0 + x (c1 + x (c2 + ...)), constants written by `constant`. */
function hornerSource(coefficients: readonly number[], x: string, constant: ConstantWriter): string {
  let text = constant(coefficients[coefficients.length - 1]);
  for (let k = coefficients.length - 2; k >= 0; k--) text = `${constant(coefficients[k])} + ${x} * (${text})`;
  return `(${text})`;
}

/**
 * {@link coshSeries} and {@link sinhSeries} of `x` as JavaScript expressions, for code generated at run time
 * (recursion-source.ts): no call that V8 might leave out of line (see decayFactorSource in
 * elementary-functions.ts); the two functions are compiled from the same text.
 */
export function hyperbolicSeriesSource(
  x: string,
  constant: ConstantWriter = literalConstant,
): { readonly cosh: string; readonly sinh: string } {
  return { cosh: hornerSource(COSH_COEFFICIENTS, x, constant), sinh: hornerSource(SINH_COEFFICIENTS, x, constant) };
}

/**
 * cosh(sqrt(x)) = sum_k x^k / (2k)! for |x| < 1, to k = 10 by Horner's rule (the first omitted term is
 * below 1 / 22! < 1e-21). The coefficients are literals (exact integers up to 21!, so each quotient is the
 * correctly rounded reciprocal). Compiled from {@link hyperbolicSeriesSource} (emitted-helper.ts).
 */
export const coshSeries: (x: number) => number = compileHelper(["x"], `return ${hyperbolicSeriesSource("x").cosh};`, {}, (x: number) =>
  hornerValue(COSH_COEFFICIENTS, x),
);

/** sinh(sqrt(x)) / sqrt(x) = sum_k x^k / (2k + 1)! for |x| < 1, like {@link coshSeries}. */
export const sinhSeries: (x: number) => number = compileHelper(["x"], `return ${hyperbolicSeriesSource("x").sinh};`, {}, (x: number) =>
  hornerValue(SINH_COEFFICIENTS, x),
);

/** Horner's rule in a loop: the same operations as {@link hornerSource}'s text (the fallback without compilation). */
function hornerValue(coefficients: readonly number[], x: number): number {
  let sum = coefficients[coefficients.length - 1];
  for (let k = coefficients.length - 2; k >= 0; k--) sum = coefficients[k] + x * sum;
  return sum;
}

/** (k + 1) / (2k + 3)!, k = 0 .. 10: dS/dlambda = dt^3 sum_k (k + 1) x^k / (2k + 3)! with x = lambda dt^2. */
export const SINH_LAMBDA_DERIVATIVE_COEFFICIENTS: readonly number[] = Array.from({ length: 11 }, (_, k) => {
  let factorial = 1;
  for (let i = 2; i <= 2 * k + 3; i++) factorial *= i;
  return (k + 1) / factorial;
});

/**
 * Text of E dS/dlambda for an oscillator step into `target`, from E C and E S of the same step: `series`
 * is the statement for |x| < 1 (x = lambda dt^2), E dt^3 sum_k (k + 1) x^k / (2k + 3)!, given `e` = E
 * (computed there by the transition), `other` the statement for the other branches,
 * (dt E C - E S) / (2 lambda), which does not cancel there. {@link oscillatorLambdaDerivative} is compiled
 * from the same text.
 */
export function oscillatorLambdaDerivativeSource(
  target: string,
  lambda: string,
  ec: string,
  es: string,
  x: string,
  constant: ConstantWriter = literalConstant,
): { readonly series: string; readonly other: string } {
  return {
    series: `${target} = e * (dt * dt * dt * ${hornerSource(SINH_LAMBDA_DERIVATIVE_COEFFICIENTS, x, constant)});`,
    other: `${target} = (dt * ${ec} - ${es}) / (2 * ${lambda});`,
  };
}

const lambdaDerivativeText = oscillatorLambdaDerivativeSource("y", "lambda", "ec", "es", "x");

/** E dS/dlambda (see {@link oscillatorLambdaDerivativeSource}); E = exp(-c dt) recomputed, the same double as in the transition. */
export const oscillatorLambdaDerivative: (c: number, lambda: number, dt: number, ec: number, es: number) => number = compileHelper(
  ["c", "lambda", "dt", "ec", "es"],
  `const x = lambda * dt * dt; let y; if (x > -1 && x < 1) { const e = decayFactor(-c * dt); ${lambdaDerivativeText.series} } else { ${lambdaDerivativeText.other} } return y;`,
  { decayFactor },
  (c: number, lambda: number, dt: number, ec: number, es: number) => {
    const x = lambda * dt * dt;
    if (x > -1 && x < 1) return decayFactor(-c * dt) * (dt * dt * dt * hornerValue(SINH_LAMBDA_DERIVATIVE_COEFFICIENTS, x));
    return (dt * ec - es) / (2 * lambda);
  },
);

/**
 * Writes [E C, E S] for E = exp(-c dt), C = cosh(sqrt(lambda) dt), S = sinh(sqrt(lambda) dt) / sqrt(lambda),
 * lambda = c^2 - w0^2 (any sign), into out[0..1]: the values of {@link dampedHyperbolicPair} without the
 * derivatives, for the per-point loops. Near lambda dt^2 = 0 (|x| < 1, x = lambda dt^2) C and S are the
 * series sum_k x^k / (2k)! and dt sum_k x^k / (2k + 1)!, summed to k = 10 by Horner's rule (the first
 * omitted term is below 1 / 22! < 1e-21); otherwise cos / sin (Q > 1/2) or the two real rates (Q < 1/2).
 */
export function dampedHyperbolicValues(c: number, lambda: number, w0: number, dt: number, out: Float64Array): void {
  const x = lambda * dt * dt;
  if (x > -1 && x < 1) {
    const e = decayFactor(-c * dt);
    const cosh = coshSeries(x);
    const sinh = sinhSeries(x);
    out[0] = e * cosh;
    out[1] = e * (dt * sinh);
  } else if (lambda < 0) {
    const omega = Math.sqrt(-lambda);
    const e = decayFactor(-c * dt);
    cosineAndSine(omega * dt, out, 0);
    out[0] = e * out[0];
    out[1] = e * (out[1] / omega);
  } else {
    const root = Math.sqrt(lambda);
    const fastRate = c + root;
    const slowRate = (w0 * w0) / fastRate; // c - root without cancellation
    const slow = decayFactor(-slowRate * dt);
    const fast = decayFactor(-fastRate * dt);
    out[0] = 0.5 * (slow + fast);
    out[1] = (slow - fast) / (2 * root);
  }
}

/**
 * Writes [E C, E S, E dC/dlambda, E dS/dlambda] for E = exp(-c dt), C = cosh(sqrt(lambda) dt),
 * S = sinh(sqrt(lambda) dt) / sqrt(lambda), with lambda = c^2 - w0^2 (any sign), into out[0..3].
 * dC/dlambda = dt S / 2 and dS/dlambda = (dt C - S) / (2 lambda) (power series near lambda dt^2 = 0; see
 * oscillatorLambdaDerivative in transition-adjoints.ts).
 */
export function dampedHyperbolicPair(c: number, lambda: number, w0: number, dt: number, out: Float64Array): void {
  dampedHyperbolicValues(c, lambda, w0, dt, out);
  out[2] = 0.5 * dt * out[1];
  out[3] = oscillatorLambdaDerivative(c, lambda, dt, out[0], out[1]);
}
