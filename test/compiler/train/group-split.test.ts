// Group-aware splits (compiler/train/group-split.ts): rows of one origin and near-identical
// texts never straddle a validation split or a fold. Data shaped like passages of documents
// (common practice, no source: grouped cross-validation keeps a document's pieces together).

import { describe, expect, it } from "vitest";
import { findClusters, groupedFolds, groupedSplit, nearDuplicateKey, sharedAcrossSplit } from "../../../compiler/train/group-split.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import { stratifiedSplit } from "../../../compiler/train/split.ts";

/** 60 documents of 2 to 9 passages each, over 3 labels; every passage text is distinct. */
function passages(): { text: string; group: string; label: number }[] {
  const random = createRandom(11);
  const rows: { text: string; group: string; label: number }[] = [];
  for (let doc = 0; doc < 60; doc++) {
    const pieces = 2 + Math.floor(random.next() * 8);
    for (let p = 0; p < pieces; p++) rows.push({ text: `document ${"abcdefghij"[doc % 10]}${"klmnopqrst"[Math.floor(doc / 10)]} passage ${"uvwxyzabcd"[p]} words`, group: `doc-${doc}`, label: doc % 3 });
  }
  return rows;
}

describe("groupedSplit", () => {
  it("keeps every group on one side of the split", () => {
    const rows = passages();
    const split = groupedSplit(rows.map((r) => r.label), findClusters(rows), 0.2, 1);
    const trainGroups = new Set(Array.from(split.train, (i) => rows[i].group));
    const validationGroups = new Set(Array.from(split.validation, (i) => rows[i].group));
    expect(validationGroups.size).toBeGreaterThan(0);
    for (const group of validationGroups) expect(trainGroups.has(group)).toBe(false);
    expect(split.train.length + split.validation.length).toBe(rows.length);
  });

  it("holds out about the asked share of rows, with every label validated", () => {
    const rows = passages();
    const split = groupedSplit(rows.map((r) => r.label), findClusters(rows), 0.2, 1);
    expect(split.validation.length / rows.length).toBeGreaterThan(0.12);
    expect(split.validation.length / rows.length).toBeLessThan(0.28);
    expect(new Set(Array.from(split.validation, (i) => rows[i].label)).size).toBe(3);
  });

  it("never lets near-identical texts straddle the split, even without a group field", () => {
    const rows: { text: string; label: number }[] = [];
    for (let i = 0; i < 200; i++) {
      const base = `order ${"abcdefghijklmnopqrst"[i % 20]} ${"uvwxyz"[i % 6]} is late`;
      // Each text comes twice: once as is, once with other digits, case and punctuation.
      rows.push({ text: `${base} #${i}`, label: i % 2 }, { text: `${base.toUpperCase()}!! (${i * 7})`, label: i % 2 });
    }
    const clusters = findClusters(rows);
    const split = groupedSplit(rows.map((r) => r.label), clusters, 0.25, 3);
    const side = new Map<string, string>();
    for (const i of split.train) side.set(nearDuplicateKey(rows[i].text), "train");
    for (const i of split.validation) expect(side.get(nearDuplicateKey(rows[i].text))).toBeUndefined();
    expect(split.validation.length).toBeGreaterThan(0);
  });

  it("splits exactly as the plain stratified split when no rows are related", () => {
    const rows = Array.from({ length: 300 }, (_, i) => ({ text: `text ${"abcdefghijklmnopqrstuvwxyz"[i % 26]}${"abcdefghijklmnopqrstuvwxyz"[Math.floor(i / 26)]}`, label: i % 4 }));
    const clusters = findClusters(rows);
    expect(clusters.clusteredRows).toBe(0);
    const grouped = groupedSplit(rows.map((r) => r.label), clusters, 0.1, 5);
    const plain = stratifiedSplit(rows.map((r) => r.label), 0.1, 5);
    expect(Array.from(grouped.validation)).toEqual(Array.from(plain.validation));
  });
});

describe("groupedFolds", () => {
  it("puts each group in exactly one fold and uses every fold", () => {
    const rows = passages();
    const folds = groupedFolds(rows.map((r) => r.label), findClusters(rows), 3, 2);
    const foldOfGroup = new Map<string, number>();
    for (let i = 0; i < rows.length; i++) {
      const seen = foldOfGroup.get(rows[i].group);
      if (seen !== undefined) expect(folds[i]).toBe(seen);
      foldOfGroup.set(rows[i].group, folds[i]);
    }
    expect(new Set(folds).size).toBe(3);
  });
});

describe("nearDuplicateKey", () => {
  it("ignores case, digits, punctuation and spacing but not the words", () => {
    expect(nearDuplicateKey("Order #123 is late!")).toBe(nearDuplicateKey("order  456 IS late"));
    expect(nearDuplicateKey("Order is late")).not.toBe(nearDuplicateKey("Order is early"));
    expect(nearDuplicateKey("12345")).toBe("");
  });
});

describe("sharedAcrossSplit", () => {
  it("counts validation rows that share a group or a near-identical text with training", () => {
    const train = [{ text: "alpha beta", group: "g1" }, { text: "gamma delta", group: "g2" }];
    const validation = [{ text: "ALPHA beta 9", group: "g9" }, { text: "new words here", group: "g2" }, { text: "unrelated", group: "g3" }];
    expect(sharedAcrossSplit(train, validation)).toEqual({ rows: 2, sharedGroups: 1, nearDuplicates: 1 });
  });
});
