// One compile of a draft: prune, quantize, fine-tune the output layer on the kept rows.

import { selectRows, subsetDraft } from "../compile/prune.ts";
import { dequantizeRows, quantizeRows } from "../compile/quantize.ts";
import { TrainingDivergedError } from "../train/divergence.ts";
import type { Draft } from "../train/draft.ts";
import type { treePaths } from "../train/huffman.ts";
import type { TrainingSource } from "../train/training-source.ts";
import type { HeaderBase } from "./base-header.ts";
import type { BuildSettings } from "./build-settings.ts";
import { contentsOf } from "./draft-contents.ts";

/** Halvings of the fine-tuning rate before a fine-tune whose loss keeps growing stops the build. */
const MAX_FINE_TUNE_RECOVERIES = 4;

/**
 * Prune to `keep` rows, quantize them, retrain the output layer on exactly those rows. The
 * fine-tune is plain SGD at a fifth of the training rate, which adaptive rates may have made
 * large (the search doubles it while that helps): when its loss grows, it starts again from the
 * draft's output layer at half the rate, and `fineTuneNote` says so.
 */
export async function compileDraft(draft: Draft, ranking: Int32Array, keep: number, source: TrainingSource, settings: BuildSettings, header: HeaderBase, paths: ReturnType<typeof treePaths> | null, rowSpace: "hidden" | "logits") {
  const kept = selectRows(ranking, keep);
  let fineTuneRate = settings.learningRate * 0.2;
  let fineTuneNote: string | null = null;
  for (let attempt = 0; ; attempt++) {
    const pruned = subsetDraft(draft, kept);
    let frozen: { values: Int8Array; scales: Float32Array } | null = null;
    if (settings.precision === "int8") {
      frozen = quantizeRows(pruned.rows, pruned.dims);
      pruned.rows = dequantizeRows(frozen.values, frozen.scales, pruned.dims);
    }
    try {
      if (settings.fineTuneEpochs > 0) {
        await source.train(pruned, { epochs: settings.fineTuneEpochs, learningRate: fineTuneRate, seed: settings.seed + 1 }, { paths, trainRows: false, threads: 1 });
      }
      return { contents: contentsOf(pruned, header, settings.precision, frozen, rowSpace), fineTuneNote };
    } catch (error) {
      if (!(error instanceof TrainingDivergedError) || attempt >= MAX_FINE_TUNE_RECOVERIES) throw error;
      fineTuneNote = `fine-tuning the output layer on the kept rows diverged at rate ${fineTuneRate} (${error.detail}); fine-tuned at ${fineTuneRate / 2}`;
      fineTuneRate /= 2;
    }
  }
}
