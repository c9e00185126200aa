// The labels of a build and its train / validation split: stratified by first label, and
// never separating rows of one group (the data's group field) or near-identical texts, so
// validation scores texts whose twins the model has not read.

import type { LabelledText } from "../evaluate/evaluate.ts";
import { findClusters, groupedSplit, sharedAcrossSplit } from "../train/group-split.ts";
import type { BuildInput } from "./build-input.ts";

export function collectLabels(examples: readonly LabelledText[]): string[] {
  const labels = new Set<string>();
  for (const example of examples) for (const label of example.labels) labels.add(label);
  return [...labels].sort();
}

/** How the split kept related rows together (or, for a validation file, how many it shares with training). */
export interface SplitReport {
  /** "holdout": the build split the data; "file": --validation; "none": no validation. */
  kind: "holdout" | "file" | "none";
  /** Rows carried a group field value. */
  grouped: boolean;
  groups: number;
  /** Clusters of rows kept on one side (groups and near-duplicates joined). */
  clusters: number;
  /** Rows in a cluster of more than one row. */
  clusteredRows: number;
  nearDuplicateJoins: number;
  /** Validation rows sharing a group or a near-identical text with a training row (0 for the build's own split). */
  sharedWithTraining: number;
}

/** Above this share of validation rows with a twin in training, the build warns. */
const SHARED_WARNING_SHARE = 0.02;

export function splitExamples(input: BuildInput, labelIndex: Map<string, number>, warnings: string[]): { train: LabelledText[]; validation: LabelledText[]; split: SplitReport } {
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

function splitBase(input: BuildInput, labelIndex: Map<string, number>, warnings: string[]): { train: LabelledText[]; validation: LabelledText[]; split: SplitReport } {
  const grouped = input.examples.some((e) => e.group !== undefined);
  const groups = grouped ? new Set(input.examples.map((e) => e.group)).size : 0;
  if (input.validation) {
    const unknown = input.validation.filter((e) => !e.labels.every((l) => labelIndex.has(l)));
    if (unknown.length > 0) warnings.push(`${unknown.length} validation examples have labels absent from the training data; they are left out of validation`);
    const validation = input.validation.filter((e) => e.labels.every((l) => labelIndex.has(l)));
    const shared = sharedAcrossSplit(input.examples, validation);
    if (validation.length > 0 && shared.rows > SHARED_WARNING_SHARE * validation.length) {
      warnings.push(
        `${shared.rows} of ${validation.length} validation rows (${((100 * shared.rows) / validation.length).toFixed(1)}%) share ${shared.sharedGroups > 0 ? `a group (${shared.sharedGroups})` : ""}${shared.sharedGroups > 0 && shared.nearDuplicates > 0 ? " or " : ""}${shared.nearDuplicates > 0 ? `a near-identical text (${shared.nearDuplicates})` : ""} with training rows: validation numbers will look better than the model is on new data`,
      );
    }
    return { train: [...input.examples], validation, split: { kind: "file", grouped, groups, clusters: 0, clusteredRows: 0, nearDuplicateJoins: 0, sharedWithTraining: shared.rows } };
  }
  if (input.settings.holdout <= 0) return { train: [...input.examples], validation: [], split: { kind: "none", grouped, groups, clusters: 0, clusteredRows: 0, nearDuplicateJoins: 0, sharedWithTraining: 0 } };
  const firstLabel = input.examples.map((e) => labelIndex.get(e.labels[0]) as number);
  const clusters = findClusters(input.examples, { nearDuplicates: input.settings.nearDuplicates !== "apart" });
  const split = groupedSplit(firstLabel, clusters, input.settings.holdout, input.settings.seed);
  if (grouped && groups < 20) warnings.push(`only ${groups} groups: validation measures few independent origins, so its numbers are uncertain beyond the interval shown`);
  return {
    train: Array.from(split.train, (i) => input.examples[i]),
    validation: Array.from(split.validation, (i) => input.examples[i]),
    split: { kind: "holdout", grouped, groups, clusters: clusters.count, clusteredRows: clusters.clusteredRows, nearDuplicateJoins: clusters.nearDuplicateJoins, sharedWithTraining: 0 },
  };
}
