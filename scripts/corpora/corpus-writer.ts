// Splits a corpus by group and writes it: train.jsonl / test.jsonl with `text`, `label`
// (a string, or an array for multi-label corpora) and `group`, plus the corpus's entry of
// the manifest. The split is fixed and seeded: a group is in the test part when the first
// four bytes of SHA-256("sluice-corpora-split-v1:" + corpus + ":" + group), read as an
// unsigned integer, are below 0.2 × 2^32. Rows of one group never straddle the split.
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { join } from "node:path";
import type { SourceRecord } from "./debian-archive.ts";
import { sha256 } from "./pins.ts";

export const TEST_FRACTION = 0.2;
export const SPLIT_SALT = "sluice-corpora-split-v1";

export interface CorpusRow {
  text: string;
  label: string | string[];
  group: string;
}

export interface CorpusDefinition {
  name: string;
  shape: string;
  description: string;
  rows: CorpusRow[];
  sources: SourceRecord[];
  /** What the preparation left out or changed, in plain words. */
  notes: string[];
}

export interface ManifestEntry {
  name: string;
  shape: string;
  description: string;
  multiLabel: boolean;
  rows: { train: number; test: number };
  groups: { train: number; test: number };
  labels: number;
  labelCounts: Record<string, number>;
  testLabelsMissingFromTrain: string[];
  split: string;
  sources: SourceRecord[];
  outputs: Record<string, string>;
  notes: string[];
}

/** True when a group belongs to the test part of a corpus (see the rule at the top). */
export function isTestGroup(corpus: string, group: string): boolean {
  const digest = createHash("sha256").update(`${SPLIT_SALT}:${corpus}:${group}`).digest();
  return digest.readUInt32BE(0) < TEST_FRACTION * 2 ** 32;
}

/** Writes a file through a temporary name, so a reader never sees half of it. */
function writeAtomic(path: string, content: string): void {
  writeFileSync(`${path}.tmp`, content);
  renameSync(`${path}.tmp`, path);
}

/**
 * One JSONL line of a corpus file (`text`, `label`, `group`, in that order).
 * @example corpusLine({ text: "hi", label: "ham", group: "g1" }) // '{"text":"hi","label":"ham","group":"g1"}'
 */
export function corpusLine(row: CorpusRow): string {
  return JSON.stringify({ text: row.text, label: row.label, group: row.group });
}

/**
 * A corpus's rows split as `writeCorpus` splits them, and each part's file content.
 * @example splitCorpus(definition).train.rows.length
 */
export function splitCorpus(corpus: CorpusDefinition): Record<"train" | "test", { rows: CorpusRow[]; content: string }> {
  const parts = { train: [] as CorpusRow[], test: [] as CorpusRow[] };
  for (const row of corpus.rows) (isTestGroup(corpus.name, row.group) ? parts.test : parts.train).push(row);
  const content = (rows: CorpusRow[]) => `${rows.map(corpusLine).join("\n")}\n`;
  return { train: { rows: parts.train, content: content(parts.train) }, test: { rows: parts.test, content: content(parts.test) } };
}

/**
 * Splits and writes one corpus under `root/<name>/`; returns its manifest entry.
 * @example writeCorpus("corpora", definition).rows.test // about a fifth of the rows
 */
export function writeCorpus(root: string, corpus: CorpusDefinition): ManifestEntry {
  const dir = join(root, corpus.name);
  mkdirSync(dir, { recursive: true });
  const train: string[] = [];
  const test: string[] = [];
  const trainGroups = new Set<string>();
  const testGroups = new Set<string>();
  const trainLabels = new Set<string>();
  const testLabels = new Set<string>();
  const labelCounts = new Map<string, number>();
  for (const row of corpus.rows) {
    if (row.text.trim() === "") throw new Error(`${corpus.name}: an empty text in group ${row.group}`);
    const inTest = isTestGroup(corpus.name, row.group);
    (inTest ? test : train).push(corpusLine(row));
    (inTest ? testGroups : trainGroups).add(row.group);
    for (const label of Array.isArray(row.label) ? row.label : [row.label]) {
      (inTest ? testLabels : trainLabels).add(label);
      labelCounts.set(label, (labelCounts.get(label) ?? 0) + 1);
    }
  }
  const outputs: Record<string, string> = {};
  for (const [file, lines] of [["train.jsonl", train], ["test.jsonl", test]] as const) {
    const content = `${lines.join("\n")}\n`;
    writeAtomic(join(dir, file), content);
    outputs[file] = sha256(content);
  }
  const sortedCounts = [...labelCounts].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]));
  const entry: ManifestEntry = {
    name: corpus.name,
    shape: corpus.shape,
    description: corpus.description,
    multiLabel: corpus.rows.some((r) => Array.isArray(r.label)),
    rows: { train: train.length, test: test.length },
    groups: { train: trainGroups.size, test: testGroups.size },
    labels: labelCounts.size,
    labelCounts: Object.fromEntries(sortedCounts),
    testLabelsMissingFromTrain: [...testLabels].filter((l) => !trainLabels.has(l)).sort(),
    split: `group in test when sha256("${SPLIT_SALT}:${corpus.name}:" + group)[0..4] < ${TEST_FRACTION} × 2^32`,
    sources: corpus.sources,
    outputs,
    notes: corpus.notes,
  };
  writeAtomic(join(dir, "manifest.json"), `${JSON.stringify(entry, null, 2)}\n`);
  return entry;
}
