/** Chains pooled into one array, chain after chain (a fresh array; the chains may differ in length). */
export function pooledChains(chains: readonly ArrayLike<number>[]): Float64Array {
  let total = 0;
  for (const chain of chains) total += chain.length;
  const out = new Float64Array(total);
  let offset = 0;
  for (const chain of chains) {
    for (let i = 0; i < chain.length; i++) out[offset + i] = chain[i];
    offset += chain.length;
  }
  return out;
}
