/** Checks that every requested time is finite (`what` names the method in the message). */
export function checkTargets(targets: ArrayLike<number>, what: string): void {
  for (let i = 0; i < targets.length; i++)
    if (!Number.isFinite(targets[i])) throw new RangeError(`${what}: requested times[${i}] is not finite (${targets[i]})`);
}

/** Sorts requested times (checked finite), remembering where each came from. */
export function sortTargets(targets: ArrayLike<number>, what: string): { sorted: Float64Array; order: Int32Array } {
  checkTargets(targets, what);
  const order = Int32Array.from({ length: targets.length }, (_, i) => i);
  order.sort((a, b) => targets[a] - targets[b]);
  const sorted = Float64Array.from(order, (i) => targets[i]);
  return { sorted, order };
}
