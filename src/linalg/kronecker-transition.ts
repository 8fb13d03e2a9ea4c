import type { TransitionBlock } from "./transition-block.js";

/**
 * The block of a product of two independent state-space processes: the product of two kernels
 * p1^T exp(F1 t) q1 and p2^T exp(F2 t) q2 is (p1 x p2)^T exp((F1 (+) F2) t) (q1 x q2), where x is the
 * Kronecker product and F1 (+) F2 = F1 x I + I x F2 the Kronecker sum, whose exponential is
 * exp(F1 t) x exp(F2 t) (Van Loan 2000, J. Comput. Appl. Math. 123, 85).
 */
export class KroneckerTransition implements TransitionBlock {
  readonly size: number;
  readonly generator: Float64Array;
  readonly parameterIndex: Int32Array;
  private readonly firstScratch: Float64Array;
  private readonly secondScratch: Float64Array;
  private readonly firstDerivatives: Float64Array;
  private readonly secondDerivatives: Float64Array;
  /** For each combined parameter, its position in the first / second factor's list (or -1). */
  private readonly firstSlot: Int32Array;
  private readonly secondSlot: Int32Array;

  constructor(
    readonly first: TransitionBlock,
    readonly second: TransitionBlock,
  ) {
    const m1 = first.size;
    const m2 = second.size;
    const m = m1 * m2;
    this.size = m;
    this.generator = new Float64Array(m * m);
    for (let i1 = 0; i1 < m1; i1++)
      for (let i2 = 0; i2 < m2; i2++)
        for (let j1 = 0; j1 < m1; j1++)
          for (let j2 = 0; j2 < m2; j2++) {
            const row = i1 * m2 + i2;
            const col = j1 * m2 + j2;
            const a = i2 === j2 ? first.generator[i1 * m1 + j1] : 0;
            const b = i1 === j1 ? second.generator[i2 * m2 + j2] : 0;
            this.generator[row * m + col] = a + b;
          }
    const union = [...new Set([...first.parameterIndex, ...second.parameterIndex])].sort((a, b) => a - b);
    this.parameterIndex = Int32Array.from(union);
    this.firstSlot = Int32Array.from(union.map((p) => first.parameterIndex.indexOf(p)));
    this.secondSlot = Int32Array.from(union.map((p) => second.parameterIndex.indexOf(p)));
    this.firstScratch = new Float64Array(m1 * m1);
    this.secondScratch = new Float64Array(m2 * m2);
    this.firstDerivatives = new Float64Array(Math.max(1, first.parameterIndex.length) * m1 * m1);
    this.secondDerivatives = new Float64Array(Math.max(1, second.parameterIndex.length) * m2 * m2);
  }

  transition(dt: number, out: Float64Array, offset: number): void {
    this.first.transition(dt, this.firstScratch, 0);
    this.second.transition(dt, this.secondScratch, 0);
    kroneckerInto(this.firstScratch, 0, this.first.size, this.secondScratch, 0, this.second.size, out, offset, false);
  }

  transitionDerivatives(dt: number, out: Float64Array, offset: number): void {
    const m1 = this.first.size;
    const m2 = this.second.size;
    const mm = this.size * this.size;
    this.first.transition(dt, this.firstScratch, 0);
    this.second.transition(dt, this.secondScratch, 0);
    if (this.first.parameterIndex.length > 0) this.first.transitionDerivatives(dt, this.firstDerivatives, 0);
    if (this.second.parameterIndex.length > 0) this.second.transitionDerivatives(dt, this.secondDerivatives, 0);
    for (let k = 0; k < this.parameterIndex.length; k++) {
      const base = offset + k * mm;
      out.fill(0, base, base + mm);
      const s1 = this.firstSlot[k];
      const s2 = this.secondSlot[k];
      if (s1 >= 0)
        kroneckerInto(this.firstDerivatives, s1 * m1 * m1, m1, this.secondScratch, 0, m2, out, base, true);
      if (s2 >= 0)
        kroneckerInto(this.firstScratch, 0, m1, this.secondDerivatives, s2 * m2 * m2, m2, out, base, true);
    }
  }

  reindexed(map: (index: number) => number): TransitionBlock {
    return new KroneckerTransition(this.first.reindexed(map), this.second.reindexed(map));
  }
}

/** Writes (or adds) the Kronecker product of an m1 x m1 and an m2 x m2 matrix into out[offset ...]. */
function kroneckerInto(
  a: Float64Array,
  aOffset: number,
  m1: number,
  b: Float64Array,
  bOffset: number,
  m2: number,
  out: Float64Array,
  offset: number,
  accumulate: boolean,
): void {
  const m = m1 * m2;
  for (let i1 = 0; i1 < m1; i1++)
    for (let j1 = 0; j1 < m1; j1++) {
      const aij = a[aOffset + i1 * m1 + j1];
      for (let i2 = 0; i2 < m2; i2++)
        for (let j2 = 0; j2 < m2; j2++) {
          const index = offset + (i1 * m2 + i2) * m + (j1 * m2 + j2);
          const value = aij * b[bOffset + i2 * m2 + j2];
          out[index] = accumulate ? out[index] + value : value;
        }
    }
}
