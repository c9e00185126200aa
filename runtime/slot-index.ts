// The kept-slot index: which rows survived pruning, found in O(1) expected time with no
// allocation. Rows are stored in ascending slot order. The top `bucketBits` bits of a slot
// pick a bucket; `buckets[b] .. buckets[b + 1]` is that bucket's row range; `keys[row]` holds
// the slot's low bits. Bucket count ≈ row count / 2, so a lookup scans about two keys, and
// the index costs about 2–3 bytes per kept row.

/** Read-only view over the two index sections. */
export class SlotIndex {
  readonly rowCount: number;
  private readonly buckets: Uint16Array | Uint32Array;
  private readonly keys: Uint8Array | Uint16Array;
  private readonly lowBits: number;
  private readonly lowMask: number;

  constructor(buckets: Uint16Array | Uint32Array, keys: Uint8Array | Uint16Array, lowBits: number) {
    this.buckets = buckets;
    this.keys = keys;
    this.lowBits = lowBits;
    this.lowMask = lowBits === 0 ? 0 : (1 << lowBits) - 1;
    this.rowCount = keys.length;
  }

  /** The row of `slot`, or -1 when the slot was pruned or never seen. */
  rowOf(slot: number): number {
    const bucket = slot >>> this.lowBits;
    const key = slot & this.lowMask;
    const keys = this.keys;
    const end = this.buckets[bucket + 1];
    for (let row = this.buckets[bucket]; row < end; row++) {
      const candidate = keys[row];
      if (candidate === key) return row;
      if (candidate > key) return -1;
    }
    return -1;
  }

  /** The slot stored at `row` (for explanations and inspection). */
  slotOf(row: number): number {
    // Binary search over the bucket directory for the bucket holding `row`.
    let low = 0;
    let high = this.buckets.length - 2;
    while (low < high) {
      const middle = (low + high + 1) >>> 1;
      if (this.buckets[middle] <= row) low = middle;
      else high = middle - 1;
    }
    return ((low << this.lowBits) | this.keys[row]) >>> 0;
  }

  /** Null when the index is well formed, else what is wrong (checked once at load). */
  static check(buckets: Uint16Array | Uint32Array, keys: Uint8Array | Uint16Array, lowBits: number): string | null {
    if (buckets[0] !== 0) return "the first bucket must start at row 0";
    if (buckets[buckets.length - 1] !== keys.length) return "the last bucket must end at the row count";
    const limit = lowBits === 0 ? 1 : 1 << lowBits;
    // One pass over the rows: keys must rise strictly inside each bucket and stay below the
    // limit. `floor` is the smallest key the next row may hold (0 at each bucket start).
    let row = 0;
    for (let b = 0; b + 1 < buckets.length; b++) {
      const end = buckets[b + 1];
      if (end < row) return `bucket ${b} ends before it starts`;
      let floor = 0;
      for (; row < end; row++) {
        const key = keys[row];
        if (key < floor) return key >= limit ? `row ${row} has a key beyond ${lowBits} bits` : `keys of bucket ${b} are not strictly increasing`;
        floor = key + 1;
      }
      if (floor > limit) return `row ${row - 1} has a key beyond ${lowBits} bits`;
    }
    return null;
  }
}

/** Bucket bits for `rowCount` kept rows in a 2^hashBits space (about two rows per bucket). */
export function chooseBucketBits(rowCount: number, hashBits: number): number {
  const wanted = Math.max(0, Math.ceil(Math.log2(Math.max(rowCount, 1))) - 1);
  return Math.min(hashBits, Math.max(hashBits - 16, wanted, 0), 24);
}
