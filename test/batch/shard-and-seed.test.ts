import { createHash } from "node:crypto";
import chisquareCdf from "@stdlib/stats/base/dists/chisquare/cdf/lib/index.js";
import { describe, expect, it } from "vitest";
import { hash48 } from "../../src/batch/id-hash.js";
import { objectSeed } from "../../src/batch/object-seed.js";
import { isInShard, parseShard, shardFromEnvironment } from "../../src/batch/shard.js";

const ids = Array.from({ length: 8000 }, (_, i) => `lf-${String(i).padStart(5, "0")}`);

describe("hash48", () => {
  it("is the first 48 bits of SHA-256, checked against the published FIPS 180-2 example digest of 'abc'", () => {
    // SHA-256("abc") = ba7816bf 8f01cfea 414140de 5dae2223 ... (FIPS 180-2, appendix B.1)
    expect(hash48("abc")).toBe(0xba7816bf8f01);
    expect(hash48("lf-00042")).toBe(parseInt(createHash("sha256").update("lf-00042").digest("hex").slice(0, 12), 16));
  });
});

describe("objectSeed", () => {
  it("depends on the run seed and the object id only, and differs between objects", () => {
    expect(objectSeed(7, "lf-00001")).toBe(objectSeed("7", "lf-00001"));
    expect(objectSeed(7, "lf-00001")).not.toBe(objectSeed(8, "lf-00001"));
    const seeds = new Set(ids.map((id) => objectSeed(7, id)));
    expect(seeds.size).toBe(ids.length);
    for (const seed of seeds) expect(Number.isSafeInteger(seed) && seed >= 0).toBe(true);
  });
});

describe("shards", () => {
  it("put every object in exactly one of N shards", () => {
    for (const count of [1, 2, 3, 7]) {
      for (const id of ids.slice(0, 500)) {
        const owners = Array.from({ length: count }, (_, index) => index).filter((index) => isInShard(id, { index, count }));
        expect(owners).toHaveLength(1);
      }
    }
  });

  it("are balanced: shard sizes pass a chi-square test of uniformity (Pearson; p-value from @stdlib/stats)", () => {
    const count = 8;
    const sizes = new Array<number>(count).fill(0);
    for (const id of ids) for (let index = 0; index < count; index++) if (isInShard(id, { index, count })) sizes[index] += 1;
    const expected = ids.length / count;
    const statistic = sizes.reduce((sum, size) => sum + (size - expected) ** 2 / expected, 0);
    const pValue = 1 - chisquareCdf(statistic, count - 1);
    expect(pValue).toBeGreaterThan(0.001);
  });

  it("parse K/N and reject what is not a shard", () => {
    expect(parseShard("2/8")).toEqual({ index: 2, count: 8 });
    expect(parseShard(" 0 / 1 ")).toEqual({ index: 0, count: 1 });
    expect(() => parseShard("8/8")).toThrow(/K runs from 0 to N-1/);
    expect(() => parseShard("1/0")).toThrow(/at least 1/);
    expect(() => parseShard("a/b")).toThrow(/K\/N/);
  });

  it("default from the variables Slurm sets in a job-array task", () => {
    expect(shardFromEnvironment({})).toBeUndefined();
    expect(shardFromEnvironment({ SLURM_ARRAY_TASK_ID: "3", SLURM_ARRAY_TASK_COUNT: "5" })).toEqual({ index: 3, count: 5 });
    // --array=1-5: task ids start at 1
    expect(
      shardFromEnvironment({ SLURM_ARRAY_TASK_ID: "1", SLURM_ARRAY_TASK_COUNT: "5", SLURM_ARRAY_TASK_MIN: "1" }),
    ).toEqual({ index: 0, count: 5 });
    // --array=0-8:2 (tasks 0, 2, 4, 6, 8)
    expect(
      shardFromEnvironment({ SLURM_ARRAY_TASK_ID: "6", SLURM_ARRAY_TASK_COUNT: "5", SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_STEP: "2" }),
    ).toEqual({ index: 3, count: 5 });
    expect(() => shardFromEnvironment({ SLURM_ARRAY_TASK_ID: "5", SLURM_ARRAY_TASK_COUNT: "5" })).toThrow(/--shard K\/N/);
  });
});
