// The labels of a build and its train / validation split (stratified by first label).

import type { LabelledText } from "../evaluate/evaluate.ts";
import { stratifiedSplit } from "../train/split.ts";
import type { BuildInput } from "./build-input.ts";

export function collectLabels(examples: readonly LabelledText[]): string[] {
  const labels = new Set<string>();
  for (const example of examples) for (const label of example.labels) labels.add(label);
  return [...labels].sort();
}

export function splitExamples(input: BuildInput, labelIndex: Map<string, number>, warnings: string[]): { train: LabelledText[]; validation: LabelledText[] } {
  const split = splitBase(input, labelIndex, warnings);
  const also = input.alsoTrain;
  if (also === undefined || also.examples.length === 0) return split;
  // Reviewed examples only ever train: holding some out would judge the new model on the traffic
  // it was fitted to, and repeats on both sides of the split would leak.
  const unknown = also.examples.find((e) => !e.labels.every((l) => labelIndex.has(l)));
  if (unknown !== undefined) throw new Error(`an extra training example has the label "${unknown.labels.find((l) => !labelIndex.has(l))}", which the base data does not have (labels: ${[...labelIndex.keys()].join(", ")})`);
  for (let r = 0; r < also.repeat; r++) split.train.push(...also.examples);
  return split;
}

function splitBase(input: BuildInput, labelIndex: Map<string, number>, warnings: string[]): { train: LabelledText[]; validation: LabelledText[] } {
  if (input.validation) {
    const unknown = input.validation.filter((e) => !e.labels.every((l) => labelIndex.has(l)));
    if (unknown.length > 0) warnings.push(`${unknown.length} validation examples have labels absent from the training data; they are left out of validation`);
    return { train: [...input.examples], validation: input.validation.filter((e) => e.labels.every((l) => labelIndex.has(l))) };
  }
  if (input.settings.holdout <= 0) return { train: [...input.examples], validation: [] };
  const firstLabel = input.examples.map((e) => labelIndex.get(e.labels[0]) as number);
  const split = stratifiedSplit(firstLabel, input.settings.holdout, input.settings.seed);
  return { train: Array.from(split.train, (i) => input.examples[i]), validation: Array.from(split.validation, (i) => input.examples[i]) };
}
