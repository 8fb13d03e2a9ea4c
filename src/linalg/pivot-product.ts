/**
 * How the recursions accumulate log det K = sum log D_n: pivots inside [PIVOT_LOW, PIVOT_HIGH] are
 * multiplied into a running product, which is folded into the sum of logarithms whenever it leaves
 * [PRODUCT_LOW, PRODUCT_HIGH]; pivots outside go straight into the sum. One logarithm per few dozen
 * points instead of one per point, with the same rounding error (a few ulp of the result per fold).
 */
export const PIVOT_LOW = 1e-100;
export const PIVOT_HIGH = 1e100;
export const PRODUCT_LOW = 1e-150;
export const PRODUCT_HIGH = 1e150;
