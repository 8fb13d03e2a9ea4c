import { hash48 } from "./id-hash.js";

/**
 * The seed of one object's fit, derived from the run seed and the object id alone: the first 48 bits of
 * SHA-256 of `"<runSeed>\u0000<objectId>"`. It does not depend on the order in which objects are read, on
 * the shard that fits the object or on the number of workers, so a catalogue split across a cluster gives
 * the same results as one process. The value is an integer, so `horologium fit FILE --seed <seed>`
 * reproduces the fit of a single object.
 *
 * @example objectSeed(7, "quasar-0001") === objectSeed("7", "quasar-0001")
 */
export function objectSeed(runSeed: number | string, objectId: string): number {
  return hash48(`${runSeed}\u0000${objectId}`);
}
