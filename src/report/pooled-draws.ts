import { pooledChains } from "../numerics/pooled-chains.js";
import type { PosteriorDraws } from "./report-input.js";

/** All draws of one parameter from every chain, concatenated chain after chain (a fresh array). */
export function pooledDraws(draws: PosteriorDraws, name: string): Float64Array {
  const chains = draws.chains[name];
  if (chains === undefined) throw new RangeError(`no posterior draws for parameter "${name}"`);
  return pooledChains(chains);
}
