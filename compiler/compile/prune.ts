// Which feature rows to keep under a row or byte budget.
//
// Criterion: importance(row) = ‖O · row‖₂ × document frequency. ‖O · row‖ is how far the
// row moves the logits when it is the only feature (the output layer O ignores directions
// it never reads, so the raw row norm would overrate them); document frequency is how
// many training texts it moves. Their product estimates a row's total effect on the
// training set's logits, so dropping the lowest-ranked rows changes the fewest decisions.

import type { Draft } from "../train/draft.ts";

/** Importance of every row of the draft (see the criterion above). */
export function rowImportance(draft: Draft): Float64Array {
  const { dims, rows, outputs, outputCount, documentFrequency } = draft;
  const rowCount = rows.length / dims;
  const importance = new Float64Array(rowCount);
  for (let row = 0; row < rowCount; row++) {
    const base = row * dims;
    let squared = 0;
    if (draft.linear) {
      // The identity output layer: O·row is the row itself (dims times fewer multiplications).
      for (let j = 0; j < dims; j++) squared += rows[base + j] * rows[base + j];
    } else {
      for (let k = 0; k < outputCount; k++) {
        let dot = 0;
        for (let j = 0; j < dims; j++) dot += outputs[k * dims + j] * rows[base + j];
        squared += dot * dot;
      }
    }
    const weight = draft.rowWeights === null ? 1 : draft.rowWeights[row];
    importance[row] = Math.sqrt(squared) * weight * documentFrequency[row];
  }
  return importance;
}

/**
 * Row ids, most important first; ties break toward the lower row id, keeping every
 * selection deterministic. Computed once per build: a size budget tries several row counts.
 */
export function rankRows(importance: Float64Array): Int32Array {
  // A bottom-up merge sort between two typed arrays. A typed array's sort with a comparator
  // copies it into a JS array and merges there: for 750k rows that grew the heap by 24 MB at
  // the point of the build where the draft takes the most memory. The order is total (no two
  // rows tie), so any correct sort gives the same ranking.
  const count = importance.length;
  let order = new Int32Array(count);
  for (let i = 0; i < count; i++) order[i] = i;
  let merged = new Int32Array(count);
  const before = (a: number, b: number) => importance[a] > importance[b] || (importance[a] === importance[b] && a < b);
  for (let width = 1; width < count; width *= 2) {
    for (let start = 0; start < count; start += 2 * width) {
      const middle = Math.min(start + width, count);
      const end = Math.min(start + 2 * width, count);
      let left = start;
      let right = middle;
      let at = start;
      while (left < middle && right < end) merged[at++] = before(order[right], order[left]) ? order[right++] : order[left++];
      while (left < middle) merged[at++] = order[left++];
      while (right < end) merged[at++] = order[right++];
    }
    [order, merged] = [merged, order];
  }
  return order;
}

/** Row ids of the `keep` highest-ranked rows, ascending (so slots stay sorted). */
export function selectRows(ranking: Int32Array, keep: number): Int32Array {
  const kept = ranking.slice(0, Math.min(keep, ranking.length));
  kept.sort(); // numeric order: a typed array sorts by value
  return kept;
}

/** A draft holding only `keptRows` (output layer copied). */
export function subsetDraft(draft: Draft, keptRows: Int32Array): Draft {
  const dims = draft.dims;
  const rows = new Float32Array(keptRows.length * dims);
  const slots = new Uint32Array(keptRows.length);
  const documentFrequency = new Uint32Array(keptRows.length);
  const rowWeights = draft.rowWeights ? new Float32Array(keptRows.length) : null;
  keptRows.forEach((row, i) => {
    rows.set(draft.rows.subarray(row * dims, (row + 1) * dims), i * dims);
    slots[i] = draft.slots[row];
    documentFrequency[i] = draft.documentFrequency[row];
    if (rowWeights && draft.rowWeights) rowWeights[i] = draft.rowWeights[row];
  });
  return {
    ...draft,
    slots,
    documentFrequency,
    rows,
    rowWeights,
    outputs: Float32Array.from(draft.outputs),
    bias: Float32Array.from(draft.bias),
    // The accumulators belong to the training run; fine-tuning the pruned draft starts plain.
    adaptive: null,
  };
}
