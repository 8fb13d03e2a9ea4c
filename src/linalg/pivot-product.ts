import { compileHelper } from "./emitted-helper.js";
import { literalConstant, type ConstantWriter } from "./generated-constants.js";

/**
 * How the recursions accumulate log det K = sum log D_n without a logarithm per point: every pivot is
 * multiplied into a running product, which exact rescalings by powers of two keep inside
 * [PRODUCT_LOW, PRODUCT_HIGH], counting the powers in a binary exponent e; at the end
 * log det K = log(product) + e ln 2 ({@link logDeterminantOf}). Pivots outside [PIVOT_LOW, PIVOT_HIGH]
 * (possible only for data in extreme units) are first brought inside the same way.
 *
 * Multiplying by a power of two is exact for normal numbers, so the only roundings are those of the
 * products (one per pivot, as many as a sum of logarithms would have) and the final logarithm. And the
 * per-point loops contain no call: V8 does not move a typed array's checks out of a loop that calls
 * out, even rarely (measured in bench/README.md), so the earlier scheme, which folded log(product) into
 * a sum whenever the product left its range, cost about a tenth of the recursion.
 */
export const PIVOT_LOW = 1e-100;
export const PIVOT_HIGH = 1e100;
export const PRODUCT_LOW = 1e-150;
export const PRODUCT_HIGH = 1e150;

/** 2^332 = 8.7e99: one step brings a pivot above PIVOT_HIGH down by about a factor 1e100. */
const PIVOT_SCALE_BITS = 332;
/** 2^498 = 1.6e150: one step brings a product that left its range back to within 1e100 of 1. */
const PRODUCT_SCALE_BITS = 498;
/** The scale factors, exact powers of two (test/linalg/pivot-product.test.ts). */
export const PIVOT_SCALE_UP = 2 ** PIVOT_SCALE_BITS;
export const PIVOT_SCALE_DOWN = 2 ** -PIVOT_SCALE_BITS;
export const PRODUCT_SCALE_UP = 2 ** PRODUCT_SCALE_BITS;
export const PRODUCT_SCALE_DOWN = 2 ** -PRODUCT_SCALE_BITS;

/**
 * Multiplies a pivot into the running product in place: `state[productSlot]` holds the product and
 * `state[exponentSlot]` the binary exponent e (log det = log(product) + e ln 2). Compiled from
 * {@link absorbPivotSource} (emitted-helper.ts); without compilation, the pivot's log2 is added to e instead.
 */
export const absorbPivot: (pivot: number, state: Float64Array, productSlot: number, exponentSlot: number) => void = compileHelper(
  ["pivot", "state", "productSlot", "exponentSlot"],
  `let product = state[productSlot]; let exponent = state[exponentSlot]; ${absorbPivotSource("pivot")} state[productSlot] = product; state[exponentSlot] = exponent; return;`,
  {},
  (pivot: number, state: Float64Array, _productSlot: number, exponentSlot: number) => {
    state[exponentSlot] += Math.log2(pivot);
  },
);

/**
 * The statements of {@link absorbPivot}, on local variables named `product` and `exponent` (declared by the
 * caller) and a positive finite `pivot` expression, with the constants written by `constant` (exact
 * literals by default): inlined by the generated recursions, compiled into {@link absorbPivot}.
 */
export function absorbPivotSource(pivot: string, constant: ConstantWriter = literalConstant): string {
  return (
    `{ let scaled = ${pivot};` +
    ` if (!(scaled > ${constant(PIVOT_LOW)} && scaled < ${constant(PIVOT_HIGH)})) {` +
    ` while (scaled > ${constant(PIVOT_HIGH)}) { scaled *= ${constant(PIVOT_SCALE_DOWN)}; exponent += ${PIVOT_SCALE_BITS}; }` +
    ` while (scaled < ${constant(PIVOT_LOW)}) { scaled *= ${constant(PIVOT_SCALE_UP)}; exponent -= ${PIVOT_SCALE_BITS}; } }` +
    ` product *= scaled;` +
    ` if (!(product > ${constant(PRODUCT_LOW)} && product < ${constant(PRODUCT_HIGH)})) {` +
    ` if (product > 1) { product *= ${constant(PRODUCT_SCALE_DOWN)}; exponent += ${PRODUCT_SCALE_BITS}; }` +
    ` else { product *= ${constant(PRODUCT_SCALE_UP)}; exponent -= ${PRODUCT_SCALE_BITS}; } } }`
  );
}

/** log det K from the running product and binary exponent: log(product) + e ln 2. */
export function logDeterminantOf(product: number, exponent: number): number {
  return Math.log(product) + exponent * Math.LN2;
}
