// The reusable output of featurize: slots of one text, plus readable names for explanations.

/** Reusable output of `featurize`: the slots of one text, plus optional readable names. */
export interface FeatureBuffer {
  slots: Uint32Array;
  count: number;
  tokenCount: number;
  truncated: boolean;
  /** When not null, `names[i]` describes `slots[i]` (explanations only: this allocates). */
  names: string[] | null;
  /**
   * With names: `sources[i]` is the original text a folded feature came from (normalization 2:
   * "frее" for the word "free"), or null when the feature reads as written.
   */
  sources: (string | null)[] | null;
}

/** A buffer for `featurize`; pass `withNames` only for explanations. */
export function createFeatureBuffer(capacity = 1024, withNames = false): FeatureBuffer {
  return { slots: new Uint32Array(capacity), count: 0, tokenCount: 0, truncated: false, names: withNames ? [] : null, sources: withNames ? [] : null };
}

export function pushSlot(out: FeatureBuffer, slot: number): void {
  if (out.count === out.slots.length) {
    const grown = new Uint32Array(out.slots.length * 2);
    grown.set(out.slots);
    out.slots = grown;
  }
  out.slots[out.count++] = slot;
}
