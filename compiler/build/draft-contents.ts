// A draft turned into model contents (float32 or int8, hidden or logit rows).

import { dequantizeRows, quantizeRows } from "../compile/quantize.ts";
import { foldOutputLayer } from "../compile/fold-output.ts";
import type { ModelContents } from "../compile/write-model.ts";
import type { Draft } from "../train/draft.ts";
import type { HeaderBase } from "./base-header.ts";

/**
 * The draft as model contents: float32 as trained, or int8 (rows quantized unless `frozenRows`
 * holds the quantized rows it was fine-tuned on). With "logits" rows the output layer is
 * multiplied into the rows (from the dequantized rows, so int8 files quantize only once more).
 */
export function contentsOf(draft: Draft, header: HeaderBase, precision: "int8" | "float32", frozenRows: { values: Int8Array; scales: Float32Array } | null, rowSpace: "hidden" | "logits"): ModelContents {
  const base = { ...header, precision, rowSpace, metrics: { ...header.metrics }, calibration: { ...header.calibration } };
  const bias = Float32Array.from(draft.bias);
  if (rowSpace === "logits") {
    const rows = frozenRows ? dequantizeRows(frozenRows.values, frozenRows.scales, draft.dims) : draft.rows;
    const folded = foldOutputLayer(rows, draft.outputs, draft.dims, draft.outputCount);
    const stored = precision === "int8" ? quantizeRows(folded, draft.outputCount) : { values: folded, scales: null };
    return { header: base, slots: draft.slots, rows: stored.values, rowScales: stored.scales, rowWeights: draft.rowWeights, outputWeights: null, outputScales: null, outputBias: bias, tree: null };
  }
  if (precision === "float32") {
    return {
      header: base,
      slots: draft.slots,
      rows: draft.rows,
      rowScales: null,
      rowWeights: draft.rowWeights,
      outputWeights: Float32Array.from(draft.outputs),
      outputScales: null,
      outputBias: bias,
      tree: draft.tree,
    };
  }
  const rows = frozenRows ?? quantizeRows(draft.rows, draft.dims);
  const outputs = quantizeRows(draft.outputs, draft.dims);
  return {
    header: base,
    slots: draft.slots,
    rows: rows.values,
    rowScales: rows.scales,
    rowWeights: draft.rowWeights,
    outputWeights: outputs.values,
    outputScales: outputs.scales,
    outputBias: bias,
    tree: draft.tree,
  };
}
