// The demo support topics split the benchmarks share: one test mail in five, chosen by the
// murmur3 hash of its CSV line number, so every benchmark scores the same 20%.
import type { LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { murmur3String } from "../../runtime/featurizer/murmur3.ts";

export async function supportTopicsSplit(): Promise<{ train: LabelledText[]; test: LabelledText[] }> {
  const train: LabelledText[] = [];
  const test: LabelledText[] = [];
  for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) {
    (murmur3String(String(e.line), 0) % 5 === 0 ? test : train).push(e);
  }
  return { train, test };
}
