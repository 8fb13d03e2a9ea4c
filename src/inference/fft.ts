/**
 * In-place radix-2 fast Fourier transform of a complex sequence (Cooley & Tukey 1965, Math. Comp. 19,
 * 297): X_k = sum_j x_j exp(-2 pi i j k / n), or with +i when `inverse` (unscaled). The length must
 * be a power of two.
 */
export function fftInPlace(re: Float64Array, im: Float64Array, inverse = false): void {
  const n = re.length;
  if (n !== im.length || (n & (n - 1)) !== 0) throw new RangeError(`FFT: length must be a power of two, got ${n}`);
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i];
      re[i] = re[j];
      re[j] = t;
      t = im[i];
      im[i] = im[j];
      im[j] = t;
    }
  }
  const sign = inverse ? 1 : -1;
  const { cosTable, sinTable } = twiddleTable(n);
  for (let size = 2; size <= n; size <<= 1) {
    const half = size >> 1;
    const stride = n / size;
    for (let k = 0; k < half; k++) {
      const wr = cosTable[k * stride];
      const wi = sign * sinTable[k * stride];
      for (let start = 0; start < n; start += size) {
        const a = start + k;
        const b = a + half;
        const xr = re[b] * wr - im[b] * wi;
        const xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] = re[a] + xr;
        im[a] = im[a] + xi;
      }
    }
  }
}

/** The smallest power of two that is at least `n`. */
export function nextPowerOfTwo(n: number): number {
  let m = 1;
  while (m < n) m <<= 1;
  return m;
}

/**
 * cos and sin of 2 pi k / n for k < n/2: one table serves every stage of a transform of length n (stage
 * `size` uses every (n/size)-th entry). Kept per length, since the convergence checks transform chains
 * of the same few lengths many times (a memo of a pure function of n).
 */
function twiddleTable(n: number): { cosTable: Float64Array; sinTable: Float64Array } {
  let table = twiddles.get(n);
  if (!table) {
    const half = n >> 1;
    table = { cosTable: new Float64Array(half), sinTable: new Float64Array(half) };
    for (let k = 0; k < half; k++) {
      const angle = (2 * Math.PI * k) / n;
      table.cosTable[k] = Math.cos(angle);
      table.sinTable[k] = Math.sin(angle);
    }
    if (twiddles.size >= 24) twiddles.clear();
    twiddles.set(n, table);
  }
  return table;
}

const twiddles = new Map<number, { cosTable: Float64Array; sinTable: Float64Array }>();
