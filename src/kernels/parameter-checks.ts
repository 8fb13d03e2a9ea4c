/**
 * Throws a RangeError naming the kernel, the parameter and the offending value unless the value is a
 * finite number strictly greater than zero.
 */
export function requirePositive(kernel: string, name: string, value: number): number {
  if (typeof value !== "number" || !Number.isFinite(value) || !(value > 0)) {
    throw new RangeError(`${kernel}: ${name} must be a finite number > 0, got ${String(value)}`);
  }
  return value;
}

/** Throws a RangeError unless min <= value <= max (both finite). */
export function requireWithin(kernel: string, name: string, value: number, min: number, max: number): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(`${kernel}: ${name} must be between ${min} and ${max}, got ${String(value)}`);
  }
  return value;
}
