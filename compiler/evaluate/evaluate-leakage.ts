// The eval-side leakage check: which evaluated examples the model was (probably) trained on,
// tested against the Bloom filter of training texts the build stored in provenance
// (see compile/text-fingerprints.ts). A Bloom filter has no false negatives, so the count
// is an upper bound: about falsePositiveRate × (examples not trained on) are wrong hits.
// When the training data was too large, the filter holds a hash sample of the training texts:
// only the evaluated texts in the same sample can be looked up, and their hits are scaled by
// 1 / sampledShare to estimate the count over all examples.

import type { Model } from "../../runtime/model/model.ts";
import { fingerprintCovers, fingerprintFalsePositiveRate, fingerprintMayContain, readTrainingFingerprint } from "../read/text-fingerprints.ts";
import type { LabelledText } from "./evaluate.ts";

/** One evaluated example that matched the fingerprint. */
export interface LeakSample {
  /** 1-based line in the data file when known, else the 1-based position in the data. */
  line: number;
  text: string;
}

/** What the check found; `checked: false` says why it could not run. */
export type LeakageReport =
  | {
      checked: true;
      method: "bloom-filter";
      /** Estimated examples trained on: `matched` / `sampledShare`, rounded. */
      count: number;
      /** Evaluated examples that tested positive. */
      matched: number;
      examples: number;
      /** Evaluated examples that could be looked up (all, unless the filter holds a sample). */
      covered: number;
      /** Share of texts the filter's sample covers (1 for training sets up to ~262 000 texts). */
      sampledShare: number;
      falsePositiveRate: number;
      /** Distinct training texts in the filter. */
      trainingTexts: number;
      samples: LeakSample[];
    }
  | { checked: false; reason: string };

/**
 * Counts examples whose normalized text is (≈) in the model's training fingerprint.
 * @example checkLeakage(model, examples) // { checked: true, count: 12, falsePositiveRate: 0.021, … }
 */
export function checkLeakage(model: Model, examples: readonly (LabelledText & { line?: number })[]): LeakageReport {
  let fingerprint;
  try {
    fingerprint = readTrainingFingerprint(model.meta.provenance.trainFingerprint);
  } catch (error) {
    return { checked: false, reason: (error as Error).message };
  }
  if (fingerprint === null) return { checked: false, reason: "the model carries no training fingerprint; it was built without one" };
  const samples: LeakSample[] = [];
  let matched = 0;
  let covered = 0;
  examples.forEach((example, i) => {
    if (!fingerprintCovers(fingerprint, example.text)) return;
    covered++;
    if (!fingerprintMayContain(fingerprint, example.text)) return;
    matched++;
    if (samples.length < 3) samples.push({ line: example.line ?? i + 1, text: example.text });
  });
  return {
    checked: true,
    method: "bloom-filter",
    count: Math.round(matched / fingerprint.sampledShare),
    matched,
    examples: examples.length,
    covered,
    sampledShare: fingerprint.sampledShare,
    falsePositiveRate: fingerprintFalsePositiveRate(fingerprint),
    trainingTexts: fingerprint.count,
    samples,
  };
}

/**
 * The eval warning line for a report, or null when nothing leaked or nothing was checked.
 * @example leakageMessage(report) // "12 examples (≈, Bloom filter with ~2% false positives) also appear in the training data …"
 */
export function leakageMessage(report: LeakageReport): string | null {
  if (!report.checked || report.count === 0) return null;
  const rate = report.falsePositiveRate < 0.1 ? `~${Math.max(1, Math.round(report.falsePositiveRate * 100))}%` : `${(report.falsePositiveRate * 100).toFixed(0)}% (a crowded filter)`;
  const samples = report.samples.map((s) => `line ${s.line} ${JSON.stringify(preview(s.text))}`).join("; ");
  const how = report.sampledShare < 1 ? `estimated from the ${report.covered} examples in a ${percent(report.sampledShare)} hash sample, Bloom filter with ${rate} false positives` : `≈, Bloom filter with ${rate} false positives`;
  return `${report.count} of ${report.examples} examples (${how}) also appear in the training data, so these metrics are optimistic; e.g. ${samples}`;
}

function percent(share: number): string {
  return `${(share * 100).toPrecision(2)}%`;
}

function preview(text: string): string {
  const flat = text.replace(/\s+/g, " ").trim();
  return flat.length > 60 ? `${flat.slice(0, 57)}...` : flat;
}
