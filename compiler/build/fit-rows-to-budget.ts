// How many rows fit a byte budget, measured on zero-filled writes.

import { selectRows } from "../compile/prune.ts";
import { writeModel } from "../compile/write-model.ts";
import type { Draft } from "../train/draft.ts";
import type { HeaderBase } from "./base-header.ts";
import type { BuildSettings } from "./build-settings.ts";

/** Approximate bytes per kept row of `width` values (for stepping toward a byte budget). */
export function rowBytes(settings: BuildSettings, width: number): number {
  // int8: the values, a one-byte scale code, a u16 weight under TF-IDF; float32: four bytes each.
  const int8 = settings.precision === "int8";
  return (int8 ? width + 1 : width * 4) + (settings.weighting === "tfidf" ? (int8 ? 2 : 4) : 0) + 3;
}

/** The largest row count (≤ upper) whose compiled file fits the byte budget, by bisection on real writes. */
export function fitRowsToBudget(draft: Draft, ranking: Int32Array, settings: BuildSettings, header: HeaderBase, upper: number, rowSpace: "hidden" | "logits"): number | null {
  // Reserve room for the metrics and policy written into the header later.
  const budget = settings.maxBytes - 2048 - 64 * draft.labels.length;
  // A file's size depends on its row count and layout, not on its values: measure writes of
  // zero-filled contents instead of pruning, folding and quantizing at every probe.
  const int8 = settings.precision === "int8";
  const width = rowSpace === "logits" ? draft.outputCount : draft.dims;
  const sizeWith = (keep: number) => {
    const kept = selectRows(ranking, keep);
    // A loop, not Uint32Array.from(kept, f): from() over an iterable first lists every value in a JS array.
    const slots = new Uint32Array(kept.length);
    for (let i = 0; i < kept.length; i++) slots[i] = draft.slots[kept[i]];
    const hidden = rowSpace === "hidden";
    return writeModel({
      header: { ...header, precision: settings.precision, rowSpace },
      slots,
      rows: int8 ? new Int8Array(kept.length * width) : new Float32Array(kept.length * width),
      rowScales: int8 ? new Float32Array(kept.length) : null,
      rowWeights: draft.rowWeights ? new Float32Array(kept.length) : null,
      outputWeights: hidden ? (int8 ? new Int8Array(draft.outputs.length) : new Float32Array(draft.outputs.length)) : null,
      outputScales: hidden && int8 ? new Float32Array(draft.outputCount) : null,
      outputBias: new Float32Array(draft.outputCount),
      tree: draft.tree,
    }).length;
  };
  let lowSize = sizeWith(0);
  if (lowSize > budget) return null;
  let highSize = sizeWith(upper);
  if (highSize <= budget) return upper;
  // Size grows almost linearly with the row count, so guess by interpolation (a few probes
  // instead of ten), falling back to the midpoint whenever a guess would not narrow the range.
  let low = 0;
  let high = upper;
  while (high - low > Math.max(1, upper >> 10)) {
    let guess = low + Math.floor(((budget - lowSize) / (highSize - lowSize)) * (high - low));
    if (guess <= low || guess >= high) guess = (low + high) >>> 1;
    const size = sizeWith(guess);
    if (size <= budget) {
      low = guess;
      lowSize = size;
      // The next probe just above the guess usually settles it.
      const step = Math.max(1, upper >> 10);
      if (guess + step < high) {
        const above = sizeWith(guess + step);
        if (above > budget) return guess;
        low = guess + step;
        lowSize = above;
      }
    } else {
      high = guess;
      highSize = size;
    }
  }
  return low;
}
