// One min/max thinner for long waveforms, shared by the server (stored runs keep at most a few
// thousand points) and the browser (plots draw at most a few thousand points of a million-point
// run). Both ends are kept; between them the samples are split into equal buckets and, in each
// bucket, the samples where every given column reaches its minimum and its maximum are kept, in
// time order and without repeats. Narrow pulses, chatter and clipping therefore survive the
// thinning: a sample that is an extreme of any column in its bucket is never dropped. This is the
// usual min/max ("peak-detect") decimation of oscilloscope displays; common practice, no source.
//
// The work can be done in slices (`advance`) so a browser never stalls on it; the server calls
// `finish` once. No allocation per bucket.

/** How many indices a bucket can contribute: a minimum and a maximum per column. */
const perBucket = (columns: number) => 2 * columns;

export class MinMaxThinner {
  private readonly columns: readonly ArrayLike<number>[];
  private readonly n: number;
  private readonly buckets: number;
  private readonly keep: Int32Array;
  private readonly scratch: Int32Array;
  private count = 0;
  private next = 0;

  /**
   * @param columns the columns whose extremes must survive, all of length `n` (at least one)
   * @param buckets how many equal buckets lie between the two end samples
   */
  constructor(columns: readonly ArrayLike<number>[], buckets: number) {
    if (columns.length === 0) throw new Error("MinMaxThinner needs at least one column");
    this.columns = columns;
    this.n = columns[0].length;
    this.buckets = Math.max(1, Math.floor(buckets));
    this.keep = new Int32Array(this.buckets * perBucket(columns.length) + 2);
    this.scratch = new Int32Array(perBucket(columns.length));
    if (this.n > 0) this.keep[this.count++] = 0;
  }

  /** True once every bucket has been looked at. */
  get done(): boolean {
    return this.next >= this.buckets;
  }

  /** Looks at up to `bucketCount` more buckets; returns `done`. */
  advance(bucketCount: number): boolean {
    const { n, buckets, columns, scratch, keep } = this;
    const inner = n - 2;
    const end = Math.min(buckets, this.next + Math.max(1, Math.floor(bucketCount)));
    for (let b = this.next; b < end; b++) {
      const from = 1 + Math.floor((b * inner) / buckets);
      const to = 1 + Math.floor(((b + 1) * inner) / buckets);
      if (to <= from) continue;
      let m = 0;
      for (const col of columns) {
        let lo = from;
        let hi = from;
        for (let i = from + 1; i < to; i++) {
          const v = col[i];
          if (v < col[lo]) lo = i;
          else if (v > col[hi]) hi = i;
        }
        scratch[m++] = lo;
        scratch[m++] = hi;
      }
      // Time order, repeats dropped: an insertion sort of at most 2 × columns indices.
      for (let i = 1; i < m; i++) {
        const x = scratch[i];
        let j = i - 1;
        while (j >= 0 && scratch[j] > x) {
          scratch[j + 1] = scratch[j];
          j--;
        }
        scratch[j + 1] = x;
      }
      for (let i = 0; i < m; i++) if (i === 0 || scratch[i] !== scratch[i - 1]) keep[this.count++] = scratch[i];
    }
    this.next = end;
    return this.done;
  }

  /** Looks at every remaining bucket and returns the indices to keep, in time order. */
  finish(): Int32Array {
    this.advance(this.buckets);
    const out = this.keep.slice(0, this.count + (this.n > 1 ? 1 : 0));
    if (this.n > 1) out[this.count] = this.n - 1;
    return out;
  }
}

/**
 * Indices to keep so that at most about `max` samples remain (every index when the columns are
 * already that short). `max` is shared among the columns' minima and maxima.
 */
export function minMaxIndices(columns: readonly ArrayLike<number>[], max: number): Int32Array {
  const n = columns[0]?.length ?? 0;
  if (n <= max) return Int32Array.from({ length: n }, (_, i) => i);
  const buckets = Math.max(1, Math.floor((max - 2) / perBucket(columns.length)));
  return new MinMaxThinner(columns, buckets).finish();
}

/** The samples of `column` at `index` (a new array). */
export function pickAt(column: ArrayLike<number>, index: Int32Array): Float64Array {
  const out = new Float64Array(index.length);
  for (let j = 0; j < index.length; j++) out[j] = column[index[j]];
  return out;
}
