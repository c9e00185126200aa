// Seeded randomness for shuffling and initialization: SplitMix32 (a 32-bit variant of
// Steele, Lea & Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014,
// with the mixing constants of MurmurHash3's finalizer). One seed makes a build reproducible.

/** A source of uniform numbers in [0, 1); injectable so tests can drive training. */
export interface RandomSource {
  next(): number;
}

/**
 * A seeded generator.
 * @example const random = createRandom(42); random.next(); // 0 ≤ x < 1, the same on every run
 */
export function createRandom(seed: number): RandomSource {
  let state = seed >>> 0;
  return {
    next(): number {
      state = (state + 0x9e3779b9) | 0;
      let z = state;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      z ^= z >>> 16;
      return (z >>> 0) / 4294967296;
    },
  };
}

/** Fisher–Yates shuffle in place (Knuth, TAOCP vol. 2, Algorithm P). */
export function shuffleInPlace(values: Int32Array | Uint32Array | number[], random: RandomSource): void {
  for (let i = values.length - 1; i > 0; i--) {
    const j = Math.floor(random.next() * (i + 1));
    const swap = values[i];
    values[i] = values[j];
    values[j] = swap;
  }
}
