// compileDraft's fine-tune (compiler/build/compile-draft.ts): the output layer is retrained on
// the kept rows with plain SGD at a fifth of the training rate. When that run's loss grows,
// the fine-tune starts again from the draft's own output layer at half the rate, and says so;
// after four halvings it gives up with the divergence. A fake training source stands in for
// the data, so the rates tried are exact.
import { describe, expect, it } from "vitest";
import { baseHeader, featurizerSettingsOf } from "../../../compiler/build/base-header.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import type { SourceBuild } from "../../../compiler/build/build-input.ts";
import { compileDraft } from "../../../compiler/build/compile-draft.ts";
import { TrainingDivergedError } from "../../../compiler/train/divergence.ts";
import { createDraft } from "../../../compiler/train/draft.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import type { TrainingSource } from "../../../compiler/train/training-source.ts";

const settings = { ...defaultBuildSettings(), dims: 4, hashBits: 12, precision: "float32" as const, learningRate: 0.5, fineTuneEpochs: 2 };
const header = baseHeader({ settings, buildTime: "2026-01-01T00:00:00.000Z" } as SourceBuild["input"], "softmax", ["a", "b"], featurizerSettingsOf(settings), 1);
const draftOf = () =>
  createDraft({ head: "softmax", labels: ["a", "b"], dims: 4, slots: Uint32Array.of(1, 2, 3), documentFrequency: Uint32Array.of(1, 1, 1), rowWeights: null, tree: null, random: createRandom(1) });

/** A source whose fine-tune diverges on its first `failures` runs, each after scribbling on the output layer. */
function divergingSource(failures: number): { source: TrainingSource; rates: number[]; outputsSeen: number[] } {
  const rates: number[] = [];
  const outputsSeen: number[] = [];
  const source: TrainingSource = {
    count: 1,
    tokenTotal: 1,
    labelCounts: Float64Array.of(1, 1),
    vocabulary: () => {
      throw new Error("not used");
    },
    async train(draft, train) {
      rates.push(train.learningRate);
      outputsSeen.push(draft.outputs[0]);
      draft.outputs[0] = 99;
      if (rates.length <= failures) throw new TrainingDivergedError(2, train.learningRate, "the mean loss grew from 0.0142 to 0.0291");
      return { seconds: 0, tokensPerSecond: 0, finalLoss: 0.01 };
    },
  };
  return { source, rates, outputsSeen };
}

describe("the fine-tune of the output layer", () => {
  it("runs once at a fifth of the training rate when its loss falls", async () => {
    const { source, rates } = divergingSource(0);
    const { fineTuneNote } = await compileDraft(draftOf(), Int32Array.of(0, 1, 2), 3, source, settings, header, null, "hidden");
    expect(rates).toEqual([0.1]);
    expect(fineTuneNote).toBeNull();
  });

  it("starts again from the draft's output layer at half the rate when its loss grows, and says so", async () => {
    const draft = draftOf();
    const { source, rates, outputsSeen } = divergingSource(2);
    const { fineTuneNote, contents } = await compileDraft(draft, Int32Array.of(0, 1, 2), 3, source, settings, header, null, "hidden");
    expect(rates).toEqual([0.1, 0.05, 0.025]);
    expect(outputsSeen).toEqual([draft.outputs[0], draft.outputs[0], draft.outputs[0]]); // never the failed run's layer
    expect(fineTuneNote).toBe("fine-tuning the output layer on the kept rows diverged at rate 0.05 (the mean loss grew from 0.0142 to 0.0291); fine-tuned at 0.025");
    expect(contents.slots.length).toBe(3);
  });

  it("gives up with the divergence after four halvings", async () => {
    const { source, rates } = divergingSource(Infinity);
    await expect(compileDraft(draftOf(), Int32Array.of(0, 1, 2), 3, source, settings, header, null, "hidden")).rejects.toThrowError(TrainingDivergedError);
    expect(rates).toEqual([0.1, 0.05, 0.025, 0.0125, 0.00625]);
  });
});
