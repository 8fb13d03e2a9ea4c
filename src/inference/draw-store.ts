/**
 * Draws kept by a sampler: for each chain (or walker) a growing row-major block of positions, one
 * row of `dimension` numbers per kept iteration, plus ln p of each row.
 */
export class DrawStore {
  readonly chains: number;
  readonly dimension: number;
  private rows: Float64Array[];
  private logPosteriors: Float64Array[];
  private count = 0;
  private capacity: number;

  constructor(chains: number, dimension: number, initialCapacity = 256) {
    this.chains = chains;
    this.dimension = dimension;
    this.capacity = Math.max(1, initialCapacity);
    this.rows = Array.from({ length: chains }, () => new Float64Array(this.capacity * dimension));
    this.logPosteriors = Array.from({ length: chains }, () => new Float64Array(this.capacity));
  }

  /** Number of kept iterations (rows per chain). */
  get length(): number {
    return this.count;
  }

  /**
   * Appends one iteration: `positions[c]` and `logPosterior[c]` for every chain c. Storage grows by
   * doubling so a long run costs amortised O(1) per row.
   */
  append(positions: readonly Float64Array[], logPosterior: ArrayLike<number>): void {
    if (this.count === this.capacity) {
      this.capacity *= 2;
      this.rows = this.rows.map((old) => {
        const grown = new Float64Array(this.capacity * this.dimension);
        grown.set(old);
        return grown;
      });
      this.logPosteriors = this.logPosteriors.map((old) => {
        const grown = new Float64Array(this.capacity);
        grown.set(old);
        return grown;
      });
    }
    for (let c = 0; c < this.chains; c++) {
      this.rows[c].set(positions[c], this.count * this.dimension);
      this.logPosteriors[c][this.count] = logPosterior[c];
    }
    this.count++;
  }

  /** The values of coordinate `index` in every chain, rows `from` (inclusive) to `to` (exclusive). */
  coordinate(index: number, from = 0, to = this.count): Float64Array[] {
    const d = this.dimension;
    return this.rows.map((block) => {
      const out = new Float64Array(to - from);
      for (let r = from; r < to; r++) out[r - from] = block[r * d + index];
      return out;
    });
  }

  /** ln p of every kept row of one chain, rows `from` to `to`. */
  logPosteriorOf(chain: number, from = 0, to = this.count): Float64Array {
    return this.logPosteriors[chain].slice(from, to);
  }

  /** One kept row of one chain (a copy). */
  row(chain: number, index: number): Float64Array {
    const d = this.dimension;
    return this.rows[chain].slice(index * d, (index + 1) * d);
  }
}
