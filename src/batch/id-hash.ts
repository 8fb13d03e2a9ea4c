import { createHash } from "node:crypto";

/**
 * The first 48 bits of the SHA-256 digest (FIPS 180-4) of a UTF-8 string, as a non-negative safe
 * integer in [0, 2^48). Platform-independent, so shard membership and per-object seeds derived from it
 * are the same on every machine of a cluster.
 *
 * @example hash48("quasar-0001") // an integer below 281474976710656
 */
export function hash48(text: string): number {
  const digest = createHash("sha256").update(text, "utf8").digest();
  return digest.readUIntBE(0, 6);
}
