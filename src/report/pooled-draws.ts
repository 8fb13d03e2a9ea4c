import type { PosteriorDraws } from "./report-input.js";

/** All draws of one parameter from every chain, concatenated chain after chain (a fresh array). */
export function pooledDraws(draws: PosteriorDraws, name: string): Float64Array {
  const chains = draws.chains[name];
  if (chains === undefined) throw new RangeError(`no posterior draws for parameter "${name}"`);
  let total = 0;
  for (const chain of chains) total += chain.length;
  const pooled = new Float64Array(total);
  let offset = 0;
  for (const chain of chains) {
    for (let i = 0; i < chain.length; i++) pooled[offset + i] = chain[i]!;
    offset += chain.length;
  }
  return pooled;
}
