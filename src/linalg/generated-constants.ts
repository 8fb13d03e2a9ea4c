/**
 * How the source emitters of the written-out recursion (unrolled-recursion.ts) write a numeric constant: as a
 * literal, or as the name of a local that holds it.
 */
export type ConstantWriter = (value: number) => string;

/** Constants as shortest round-trip literals, which parse back to the same doubles (the emitters' default). */
export const literalConstant: ConstantWriter = (value) => `(${String(value)})`;

/** Distinct constants, each named once, and their values in order. */
export interface ConstantPool {
  readonly write: ConstantWriter;
  /** The values named so far; element i is held by the local `${prefix}${i}`. */
  readonly values: number[];
  /** Statements declaring every local from `arrayName[i]`. */
  declarations(arrayName: string): string;
}

/**
 * A pool that replaces every constant by a local read from an array before the loop.
 *
 * Why: V8 rebuilds a double literal from an integer register at every use (two instructions), and the
 * exponential alone uses a dozen; locals read from a Float64Array are doubles in registers or, when
 * registers run out, one memory operand each. Measured in interleaved A/B runs of the written-out
 * recursion (same results bit for bit): 0.95 of the time for R = 1 and 8, 0.92 for R = 2 and 4.
 */
export function constantPool(prefix: string): ConstantPool {
  const values: number[] = [];
  const index = new Map<number, number>();
  return {
    values,
    write(value) {
      let i = index.get(value);
      if (i === undefined) {
        i = values.length;
        values.push(value);
        index.set(value, i);
      }
      return `${prefix}${i}`;
    },
    declarations(arrayName) {
      return values.map((_, i) => `const ${prefix}${i} = ${arrayName}[${i}];`).join(" ");
    },
  };
}
