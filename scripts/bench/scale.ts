// Scale: the tree head against softmax on many labels, where `--head auto` should switch,
// and training throughput on one and two threads.
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import type { LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { syntheticLabelData } from "../../test/fixtures/synthetic-labels.ts";

export interface HeadRow {
  labels: number;
  head: string;
  trainSeconds: number;
  accuracy: number;
}

/** Tree vs softmax at several label counts (dims 16, words + pairs, same epochs). */
export async function runHeads(labelCounts = [16, 64, 256, 1000]): Promise<HeadRow[]> {
  const rows: HeadRow[] = [];
  for (const labels of labelCounts) {
    const examples = syntheticLabelData(labels, Math.max(20000, labels * 30), 11);
    for (const head of ["softmax", "tree"] as const) {
      const settings = { ...defaultBuildSettings(), head, dims: 16, charSpan: [0, 0] as [number, number], epochs: 5, hashBits: 18, calibrate: false, fineTuneEpochs: 1 };
      const { report } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
      rows.push({ labels, head, trainSeconds: report.trainSeconds, accuracy: report.compiled.accuracy });
    }
  }
  return rows;
}

export interface ThreadRow {
  threads: number;
  trainSeconds: number;
  tokensPerSecond: number;
  accuracy: number;
}

/**
 * Training throughput on 1 and 2 threads (dims 16, words + pairs, softmax): `repeats`
 * alternating runs of each, median training time (single runs on this shared 2-core VM
 * varied from 1.2x to 2.4x).
 */
export async function runThreads(examples: LabelledText[], epochs = 10, repeats = 3): Promise<ThreadRow[]> {
  const runs: Record<number, ThreadRow[]> = { 1: [], 2: [] };
  for (let r = 0; r < repeats; r++) {
    for (const threads of [1, 2]) {
      const settings = { ...defaultBuildSettings(), threads, dims: 16, charSpan: [0, 0] as [number, number], epochs };
      const { report } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
      runs[threads].push({ threads, trainSeconds: report.trainSeconds, tokensPerSecond: report.tokensPerSecond, accuracy: report.compiled.accuracy });
    }
  }
  return [1, 2].map((threads) => {
    const sorted = [...runs[threads]].sort((a, b) => a.trainSeconds - b.trainSeconds);
    return sorted[Math.floor(sorted.length / 2)];
  });
}
