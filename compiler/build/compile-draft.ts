// One compile of a draft: prune, quantize, fine-tune the output layer on the kept rows.

import { selectRows, subsetDraft } from "../compile/prune.ts";
import { dequantizeRows, quantizeRows } from "../compile/quantize.ts";
import type { Draft } from "../train/draft.ts";
import type { treePaths } from "../train/huffman.ts";
import type { TrainingSource } from "../train/training-source.ts";
import type { HeaderBase } from "./base-header.ts";
import type { BuildSettings } from "./build-settings.ts";
import { contentsOf } from "./draft-contents.ts";

/** Prune to `keep` rows, quantize them, retrain the output layer on exactly those rows. */
export async function compileDraft(draft: Draft, ranking: Int32Array, keep: number, source: TrainingSource, settings: BuildSettings, header: HeaderBase, paths: ReturnType<typeof treePaths> | null, rowSpace: "hidden" | "logits") {
  const pruned = subsetDraft(draft, selectRows(ranking, keep));
  let frozen: { values: Int8Array; scales: Float32Array } | null = null;
  if (settings.precision === "int8") {
    frozen = quantizeRows(pruned.rows, pruned.dims);
    pruned.rows = dequantizeRows(frozen.values, frozen.scales, pruned.dims);
  }
  if (settings.fineTuneEpochs > 0) {
    await source.train(pruned, { epochs: settings.fineTuneEpochs, learningRate: settings.learningRate * 0.2, seed: settings.seed + 1 }, { paths, trainRows: false, threads: 1 });
  }
  return { contents: contentsOf(pruned, header, settings.precision, frozen, rowSpace) };
}
