import { UsageError } from "../errors/usage-error.js";
import { hash48 } from "./id-hash.js";

/** One share of a catalogue: shard `index` (0-based) of `count`. */
export interface ShardSpec {
  readonly index: number;
  readonly count: number;
}

/** The whole catalogue as a single shard. */
export const WHOLE_CATALOGUE: ShardSpec = { index: 0, count: 1 };

/**
 * Parses `K/N` (0 <= K < N), the form of `--shard`.
 *
 * @example parseShard("2/8") // { index: 2, count: 8 }
 */
export function parseShard(text: string): ShardSpec {
  const match = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (!match) throw new UsageError(`--shard must look like K/N (for example 0/8), got "${text}"`);
  const index = Number(match[1]);
  const count = Number(match[2]);
  if (count < 1) throw new UsageError(`--shard ${text}: the number of shards must be at least 1`);
  if (index >= count) throw new UsageError(`--shard ${text}: K runs from 0 to N-1`);
  return { index, count };
}

/** Formats a shard as `K/N`. */
export function formatShard(shard: ShardSpec): string {
  return `${shard.index}/${shard.count}`;
}

/**
 * The shard a Slurm job-array task should fit, from the variables Slurm sets in each task:
 * K = (SLURM_ARRAY_TASK_ID - SLURM_ARRAY_TASK_MIN) / SLURM_ARRAY_TASK_STEP and N = SLURM_ARRAY_TASK_COUNT
 * (MIN defaults to 0 and STEP to 1). Returns undefined outside a job array.
 */
export function shardFromEnvironment(env: Readonly<Record<string, string | undefined>>): ShardSpec | undefined {
  const id = env.SLURM_ARRAY_TASK_ID;
  const count = env.SLURM_ARRAY_TASK_COUNT;
  if (id === undefined || count === undefined || id === "" || count === "") return undefined;
  const min = Number(env.SLURM_ARRAY_TASK_MIN ?? 0);
  const step = Number(env.SLURM_ARRAY_TASK_STEP ?? 1);
  const n = Number(count);
  const offset = Number(id) - min;
  const where = `SLURM_ARRAY_TASK_ID=${id}, SLURM_ARRAY_TASK_MIN=${min}, SLURM_ARRAY_TASK_STEP=${step}, SLURM_ARRAY_TASK_COUNT=${count}`;
  if (![n, offset, step].every(Number.isInteger) || n < 1 || step < 1 || offset < 0 || offset % step !== 0) {
    throw new UsageError(`cannot derive a shard from ${where}; pass --shard K/N`);
  }
  const index = offset / step;
  if (index >= n) throw new UsageError(`cannot derive a shard from ${where} (task beyond the count); pass --shard K/N`);
  return { index, count: n };
}

/**
 * Whether an object belongs to a shard: hash48("shard\u0000" + id) mod N == K. Membership depends on the
 * id alone, so every object falls in exactly one of the N shards whatever the order of the input.
 */
export function isInShard(objectId: string, shard: ShardSpec): boolean {
  if (shard.count === 1) return true;
  return hash48(`shard\u0000${objectId}`) % shard.count === shard.index;
}
