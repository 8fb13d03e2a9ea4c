import { compileHelper } from "./emitted-helper.js";
import { literalConstant, type ConstantWriter } from "./generated-constants.js";

/**
 * exp, cos and sin written out in TypeScript for the per-point loops of the engine. V8 implements
 * `Math.exp`, `Math.cos` and `Math.sin` as calls into C that it cannot inline, about 40 ns each on the
 * benchmark machine (bench/README.md); written here as straight-line arithmetic they are inlined into the
 * recursions, take about half as long, and, being off the recursion's critical path, overlap with it.
 *
 * Accuracy: exp within 1 ulp (results that would overflow or be subnormal are left to `Math.exp`, or
 * flushed to zero by `decayFactor`); cos and sin within 2^-52 absolute (they enter bounded transition
 * matrices, where absolute error is what counts). Checked against `Math.exp`, `Math.cos` and `Math.sin` on
 * 10^6 arguments each in test/linalg/elementary-functions.test.ts.
 */

/** ln 2 / 64 in two parts: the high part has its 21 low bits zero, so k * HIGH is exact for |k| < 2^21. */
const LN2_BY_64_HIGH = 6.93147180369123816490e-1 / 64;
const LN2_BY_64_LOW = 1.90821492927058770002e-10 / 64;
const INVERSE_LN2_BY_64 = 64 / Math.LN2;
/** Adding and subtracting 1.5 * 2^52 rounds a double of magnitude below 2^51 to the nearest integer. */
const ROUNDING_SHIFT = 6755399441055744;

/** 2^(j / 64), j = 0 .. 63, as a double and the rounding error of that double (Tang 1989, table of S_lead, S_trail). */
const TWO_TO_J_BY_64 = new Float64Array(64);
const TWO_TO_J_BY_64_TAIL = new Float64Array(64);
/** 2^m for m = -1022 .. 1023 at index m + 1022. */
const TWO_TO_M = new Float64Array(2046);
for (let m = -1022; m <= 1023; m++) TWO_TO_M[m + 1022] = 2 ** m;
for (let j = 0; j < 64; j++) {
  const value = 2 ** (j / 64);
  TWO_TO_J_BY_64[j] = value;
  TWO_TO_J_BY_64_TAIL[j] = twoToFractionTail(j, value);
}

/**
 * The rounding error 2^(j/64) - value, from one Newton step on value^64 = 2^j carried out in
 * double-double arithmetic (Dekker 1971 products): error = (2^j - value^64) / (64 value^63).
 */
function twoToFractionTail(j: number, value: number): number {
  // value^64 by six exact squarings in double-double.
  let hi = value;
  let lo = 0;
  for (let i = 0; i < 6; i++) {
    const p = hi * hi;
    const e = exactProductError(hi, hi, p) + 2 * hi * lo;
    hi = p + e;
    lo = e - (hi - p);
  }
  const residual = 2 ** j - hi - lo;
  return residual / (64 * value ** 63);
}

/** a * b - p exactly, for p = fl(a * b) (Veltkamp splitting, Dekker 1971). */
function exactProductError(a: number, b: number, p: number): number {
  const split = 134217729; // 2^27 + 1
  const ca = split * a;
  const ah = ca - (ca - a);
  const al = a - ah;
  const cb = split * b;
  const bh = cb - (cb - b);
  const bl = b - bh;
  return ah * bh - p + ah * bl + al * bh + al * bl;
}

/** Coefficients of exp(r) - 1 - r on |r| <= ln 2 / 128: Taylor's 1/k! to k = 6 (truncation below 2^-66). */
const E2 = 1 / 2;
const E3 = 1 / 6;
const E4 = 1 / 24;
const E5 = 1 / 120;
const E6 = 1 / 720;

/**
 * e^x by the table-driven method of Tang (1989, ACM TOMS 15, 144): x = (64 m + j) ln2/64 + r with
 * |r| <= ln2/128, e^x = 2^m 2^(j/64) e^r, e^r - 1 from a degree-6 polynomial. Arguments whose result would
 * overflow or be subnormal (|x| > 708) go to `Math.exp`.
 */
export function exponential(x: number): number {
  return x > -708 && x < 708 ? tableExponential(x) : Math.exp(x);
}

/**
 * e^x for the decay factors of transitions (x <= 0 in use), with results below 2^-1021 (x < -708) flushed
 * to zero: a correlation that small is zero in every sum it enters. Unlike {@link exponential} it never
 * calls out, which lets V8 keep the recursions' state in registers around it (measured in
 * bench/README.md). Valid up to x = 708 like the table itself. Compiled from {@link decayFactorSource}
 * (emitted-helper.ts).
 */
export const decayFactor: (x: number) => number = compileHelper(
  ["x"],
  `let y; ${decayFactorSource("y", "x")} return y;`,
  tableBindings(),
  (x: number) => (x < -708 ? 0 : Math.exp(x)),
);

/** The tables of the table-driven exponential, passed to generated code that uses {@link decayFactorSource}. */
export const EXPONENTIAL_TABLES = Object.freeze({
  twoToJBy64: TWO_TO_J_BY_64,
  twoToJBy64Tail: TWO_TO_J_BY_64_TAIL,
  twoToM: TWO_TO_M,
});

/** The names under which generated code must receive {@link EXPONENTIAL_TABLES}, in this order. */
export const EXPONENTIAL_TABLE_NAMES = ["twoToJBy64", "twoToJBy64Tail", "twoToM"] as const;

/**
 * JavaScript statements that set the variable `target` (declared by the caller) to decayFactor(`argument`),
 * for code generated at run time (unrolled-recursion.ts), which must receive the tables under
 * {@link EXPONENTIAL_TABLE_NAMES}; {@link decayFactor} is compiled from the same text.
 *
 * Why not a call: V8 inlines a call only while the caller is small; past that it calls out, which boxes
 * the double argument and result on the heap at every point (measured: the two-component recursion
 * allocated about 90 bytes per point before its transitions were written out this way). Constants
 * are written by `n` (shortest round-trip literals by default, or pooled locals: generated-constants.ts),
 * the same doubles either way, so the results are bit-identical to {@link decayFactor}'s
 * (test/linalg/elementary-functions.test.ts).
 */
export function decayFactorSource(target: string, argument: string, n: ConstantWriter = literalConstant): string {
  return `{ const ex = ${argument}; if (ex < -708) { ${target} = 0; } else {${tableExponentialSource(target, "ex", n)} } }`;
}

/** The statements of the table-driven e^(`x`) into `target`, for -708 <= x <= 708 (NaN propagates). */
function tableExponentialSource(target: string, x: string, n: ConstantWriter): string {
  return (
    ` const ekf = ${x} * ${n(INVERSE_LN2_BY_64)} + ${n(ROUNDING_SHIFT)} - ${n(ROUNDING_SHIFT)};` +
    ` const er1 = ${x} - ekf * ${n(LN2_BY_64_HIGH)}; const er2 = ekf * ${n(LN2_BY_64_LOW)}; const er = er1 - er2;` +
    ` const ek = ekf | 0; const ej = ek & 63; const em = (ek - ej) >> 6;` +
    ` const eq = er * er * (${n(E2)} + er * (${n(E3)} + er * (${n(E4)} + er * (${n(E5)} + er * ${n(E6)}))));` +
    ` const ep = er1 + (eq - er2); const es = twoToJBy64[ej]; const et = twoToJBy64Tail[ej];` +
    ` ${target} = twoToM[em + 1022] * (es + (et + es * ep + et * ep));`
  );
}

/** The tables under the names the emitted text uses. */
function tableBindings(): Record<string, Float64Array> {
  return { twoToJBy64: TWO_TO_J_BY_64, twoToJBy64Tail: TWO_TO_J_BY_64_TAIL, twoToM: TWO_TO_M };
}

/** The table-driven e^x, for -708 <= x <= 708 (NaN propagates), compiled from its source text. */
const tableExponential: (x: number) => number = compileHelper(
  ["x"],
  `let y;${tableExponentialSource("y", "x", literalConstant)} return y;`,
  tableBindings(),
  Math.exp,
);

/** pi/2 in three parts of 33, 33 and 53 bits (Cody & Waite 1980 reduction; the values of fdlibm's k_rem_pio2). */
const PIO2_1 = 1.57079632673412561417e0;
const PIO2_2 = 6.07710050630396597660e-11;
const PIO2_3 = 2.02226624871116645580e-21;
const TWO_BY_PI = 0.636619772367581343076;
/** Above this |x| the three-part reduction loses accuracy; `Math.cos`/`Math.sin` take over. */
const REDUCTION_LIMIT = 1e5;

/** Minimax coefficients of sin and cos on [-pi/4, pi/4] (Sun Microsystems fdlibm, k_sin.c and k_cos.c). */
const S1 = -1.66666666666666324348e-1;
const S2 = 8.33333333332248946124e-3;
const S3 = -1.98412698298579493134e-4;
const S4 = 2.75573137070700676789e-6;
const S5 = -2.50507602534068634195e-8;
const S6 = 1.58969099521155010221e-10;
const C1 = 4.16666666666666019037e-2;
const C2 = -1.38888888888741095749e-3;
const C3 = 2.48015872894767294178e-5;
const C4 = -2.75573143513906633035e-7;
const C5 = 2.08757232129817482790e-9;
const C6 = -1.13596475577881948265e-11;

/**
 * JavaScript statements that set the variables `cosTarget` and `sinTarget` (declared by the caller) to the
 * cosine and sine of `argument`, for generated code (see {@link decayFactorSource} for why not a call);
 * {@link cosineAndSine} is compiled from the same text.
 */
export function cosineAndSineSource(cosTarget: string, sinTarget: string, argument: string, n: ConstantWriter = literalConstant): string {
  return (
    `{ const cx = ${argument};` +
    ` if (!(cx > ${n(-REDUCTION_LIMIT)} && cx < ${n(REDUCTION_LIMIT)})) { ${cosTarget} = Math.cos(cx); ${sinTarget} = Math.sin(cx); } else {` +
    ` const cnf = cx * ${n(TWO_BY_PI)} + ${n(ROUNDING_SHIFT)} - ${n(ROUNDING_SHIFT)};` +
    ` const cy = cx - cnf * ${n(PIO2_1)} - cnf * ${n(PIO2_2)} - cnf * ${n(PIO2_3)}; const cz = cy * cy;` +
    ` const csin = cy + cy * cz * (${n(S1)} + cz * (${n(S2)} + cz * (${n(S3)} + cz * (${n(S4)} + cz * (${n(S5)} + cz * ${n(S6)})))));` +
    ` const chz = 0.5 * cz; const cw = 1 - chz;` +
    ` const ccos = cw + (1 - cw - chz + cz * cz * (${n(C1)} + cz * (${n(C2)} + cz * (${n(C3)} + cz * (${n(C4)} + cz * (${n(C5)} + cz * ${n(C6)}))))));` +
    ` const cq = (cnf | 0) & 3;` +
    ` if (cq === 0) { ${cosTarget} = ccos; ${sinTarget} = csin; } else if (cq === 1) { ${cosTarget} = -csin; ${sinTarget} = ccos; }` +
    ` else if (cq === 2) { ${cosTarget} = -ccos; ${sinTarget} = -csin; } else { ${cosTarget} = csin; ${sinTarget} = -ccos; } } }`
  );
}

/**
 * cos x and sin x together, written to out[offset] and out[offset + 1]: one Cody-Waite reduction
 * x = n pi/2 + y, |y| <= pi/4, then fdlibm's polynomials for sin y and cos y and the quadrant n mod 4.
 * Absolute error below 2^-52 for |x| <= 1e5; larger |x| use `Math.cos` and `Math.sin`. Compiled from
 * {@link cosineAndSineSource} (emitted-helper.ts).
 */
export const cosineAndSine: (x: number, out: Float64Array, offset: number) => void = compileHelper(
  ["x", "out", "offset"],
  `let c; let s; ${cosineAndSineSource("c", "s", "x")} out[offset] = c; out[offset + 1] = s; return;`,
  {},
  (x: number, out: Float64Array, offset: number) => {
    out[offset] = Math.cos(x);
    out[offset + 1] = Math.sin(x);
  },
);
