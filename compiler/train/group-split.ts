// Splits that keep related rows together. A validation example whose twin (a passage of the
// same document, a reply in the same thread, a near-copy of the same message) sits in the
// training part is scored on something the model has already read, and validation then looks
// better than the model is. Rows are joined into clusters when they share a group (the data's
// group field) or a near-duplicate key (the text with case, digits, punctuation and spacing
// taken out); whole clusters then go to one side of a split or fold.

import { murmur3String } from "../../runtime/featurizer/murmur3.ts";
import { normalizeText } from "../../runtime/featurizer/normalize.ts";
import { createRandom, shuffleInPlace } from "./random.ts";
import { stratifiedSplit } from "./split.ts";

/** Where each row's cluster is: rows with equal ids must stay on one side. */
export interface Clusters {
  /** Cluster id of each row (0..count-1). */
  clusterOf: Int32Array;
  count: number;
  /** Rows whose cluster has more than one row. */
  clusteredRows: number;
  /** Clusters joined only because two texts were near-identical (not by the group field). */
  nearDuplicateJoins: number;
}

/** Near-duplicate keys read at most this many characters: long texts that agree this far are copies. */
const KEY_CHARACTERS = 4000;
const LETTERS_ONLY = /[^\p{L}]+/gu;

/**
 * The near-duplicate key of a text: normalized, lower-cased letters only, in order (digits, punctuation,
 * spacing and markup between words do not count), hashed twice to 64 bits.
 * @example nearDuplicateKey("Order #123 is late!") === nearDuplicateKey("order 456 is LATE") // true
 */
export function nearDuplicateKey(text: string): string {
  // The featurizer's normalization first (NFKC folds fullwidth and styled letters), so texts it reads alike share a key.
  const letters = normalizeText(text.slice(0, KEY_CHARACTERS)).toLowerCase().replace(LETTERS_ONLY, " ").trim();
  // Texts without letters (numbers only, emoji) are never joined: they have no key.
  if (letters === "") return "";
  return `${murmur3String(letters, 0x9747b28c).toString(36)}.${murmur3String(letters, 0x2f0b3c1d).toString(36)}.${letters.length}`;
}

/**
 * Joins rows that share a group or a near-duplicate key (union–find, Tarjan 1975).
 * @example findClusters([{ text: "a b", group: "doc1" }, { text: "c d", group: "doc1" }]).count // 1
 */
export function findClusters(rows: readonly { text: string; group?: string }[], options: { nearDuplicates?: boolean } = {}): Clusters {
  const parent = Int32Array.from({ length: rows.length }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  };
  const byGroup = new Map<string, number>();
  const byText = new Map<string, number>();
  let nearDuplicateJoins = 0;
  for (let i = 0; i < rows.length; i++) {
    const group = rows[i].group;
    if (group !== undefined) {
      const first = byGroup.get(group);
      if (first === undefined) byGroup.set(group, i);
      else parent[find(i)] = find(first);
    }
  }
  for (let i = 0; i < rows.length && options.nearDuplicates !== false; i++) {
    const key = nearDuplicateKey(rows[i].text);
    if (key === "") continue;
    const first = byText.get(key);
    if (first === undefined) {
      byText.set(key, i);
      continue;
    }
    const a = find(i);
    const b = find(first);
    if (a !== b) {
      parent[a] = b;
      nearDuplicateJoins++;
    }
  }
  const clusterOf = new Int32Array(rows.length);
  const idOfRoot = new Map<number, number>();
  const sizes: number[] = [];
  for (let i = 0; i < rows.length; i++) {
    const root = find(i);
    let id = idOfRoot.get(root);
    if (id === undefined) {
      id = idOfRoot.size;
      idOfRoot.set(root, id);
      sizes.push(0);
    }
    clusterOf[i] = id;
    sizes[id]++;
  }
  let clusteredRows = 0;
  for (const size of sizes) if (size > 1) clusteredRows += size;
  return { clusterOf, count: idOfRoot.size, clusteredRows, nearDuplicateJoins };
}

/**
 * A validation split that never separates a cluster, stratified by label: each cluster counts
 * under its first row's label, and clusters are dealt to validation in a seeded order until the
 * label's share reaches `holdout`. With no cluster larger than one row it is exactly
 * stratifiedSplit, so data without groups or duplicates splits as it always did.
 * @example groupedSplit([0, 0, 1, 1], { clusterOf: Int32Array.of(0, 0, 1, 2), count: 3, clusteredRows: 2, nearDuplicateJoins: 0 }, 0.5, 1)
 */
export function groupedSplit(labelOfExample: ArrayLike<number>, clusters: Clusters, holdout: number, seed: number): { train: Int32Array; validation: Int32Array } {
  if (clusters.clusteredRows === 0) return stratifiedSplit(labelOfExample, holdout, seed);
  const rowsOfCluster: number[][] = Array.from({ length: clusters.count }, () => []);
  for (let i = 0; i < labelOfExample.length; i++) rowsOfCluster[clusters.clusterOf[i]].push(i);
  const clustersOfLabel = new Map<number, number[]>();
  const rowsOfLabel = new Map<number, number>();
  for (let c = 0; c < clusters.count; c++) {
    const label = labelOfExample[rowsOfCluster[c][0]];
    const list = clustersOfLabel.get(label);
    if (list) list.push(c);
    else clustersOfLabel.set(label, [c]);
  }
  for (let i = 0; i < labelOfExample.length; i++) rowsOfLabel.set(labelOfExample[i], (rowsOfLabel.get(labelOfExample[i]) ?? 0) + 1);
  const random = createRandom(seed ^ 0x5bd1e995);
  const inValidation = new Uint8Array(labelOfExample.length);
  for (const label of [...clustersOfLabel.keys()].sort((a, b) => a - b)) {
    const list = clustersOfLabel.get(label) as number[];
    shuffleInPlace(list, random);
    const target = Math.round((rowsOfLabel.get(label) ?? 0) * holdout);
    let taken = 0;
    let takenClusters = 0;
    for (const cluster of list) {
      if (takenClusters === list.length - 1) break; // the label keeps at least one cluster for training
      const size = rowsOfCluster[cluster].length;
      // Take a cluster when it brings the label's share closer to the target; the first one
      // anyway (like stratifiedSplit, a label with two or more clusters is always validated).
      const closer = Math.abs(taken + size - target) < Math.abs(taken - target);
      const first = taken === 0 && holdout > 0 && list.length >= 2;
      if (!closer && !first) continue;
      for (const row of rowsOfCluster[cluster]) inValidation[row] = 1;
      taken += size;
      takenClusters++;
    }
  }
  const train: number[] = [];
  const validation: number[] = [];
  for (let i = 0; i < labelOfExample.length; i++) (inValidation[i] ? validation : train).push(i);
  return { train: Int32Array.from(train), validation: Int32Array.from(validation) };
}

/**
 * Fold of each row for k-fold cross-validation, whole clusters at a time: within each label,
 * clusters in a seeded order go to the fold that has the fewest of that label's rows so far.
 * @example groupedFolds([0, 0, 1, 1], findClusters(rows), 2, 7) // Int32Array of fold ids
 */
export function groupedFolds(labelOfExample: ArrayLike<number>, clusters: Clusters, folds: number, seed: number): Int32Array {
  const rowsOfCluster: number[][] = Array.from({ length: clusters.count }, () => []);
  for (let i = 0; i < labelOfExample.length; i++) rowsOfCluster[clusters.clusterOf[i]].push(i);
  const clustersOfLabel = new Map<number, number[]>();
  for (let c = 0; c < clusters.count; c++) {
    const label = labelOfExample[rowsOfCluster[c][0]];
    const list = clustersOfLabel.get(label);
    if (list) list.push(c);
    else clustersOfLabel.set(label, [c]);
  }
  const random = createRandom(seed ^ 0x51f1);
  const fold = new Int32Array(labelOfExample.length);
  for (const label of [...clustersOfLabel.keys()].sort((a, b) => a - b)) {
    const list = clustersOfLabel.get(label) as number[];
    shuffleInPlace(list, random);
    const filled = new Float64Array(folds);
    for (const cluster of list) {
      let target = 0;
      for (let f = 1; f < folds; f++) if (filled[f] < filled[target]) target = f;
      filled[target] += rowsOfCluster[cluster].length;
      for (const row of rowsOfCluster[cluster]) fold[row] = target;
    }
  }
  return fold;
}

/**
 * How many validation rows share a group or a near-duplicate key with some training row (for a
 * validation file given separately, where the build did not choose the split).
 * @example sharedAcrossSplit(train, validation) // { sharedGroups: 3, nearDuplicates: 5, rows: 8 }
 */
export function sharedAcrossSplit(train: readonly { text: string; group?: string }[], validation: readonly { text: string; group?: string }[]): { rows: number; sharedGroups: number; nearDuplicates: number } {
  const groups = new Set<string>();
  const keys = new Set<string>();
  for (const row of train) {
    if (row.group !== undefined) groups.add(row.group);
    const key = nearDuplicateKey(row.text);
    if (key !== "") keys.add(key);
  }
  let rows = 0;
  let sharedGroups = 0;
  let nearDuplicates = 0;
  for (const row of validation) {
    const group = row.group !== undefined && groups.has(row.group);
    const key = nearDuplicateKey(row.text);
    const duplicate = key !== "" && keys.has(key);
    if (group) sharedGroups++;
    if (duplicate) nearDuplicates++;
    if (group || duplicate) rows++;
  }
  return { rows, sharedGroups, nearDuplicates };
}
