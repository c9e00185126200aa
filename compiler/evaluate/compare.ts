// Live model vs candidate on the same labelled data: metric deltas, McNemar's test on paired
// correctness, and the examples whose predicted label flips. Both models are scored through
// the runtime; the predicted label is the top-scored one and the gold label the example's
// first (as in `sluice eval` for softmax and tree heads; a sigmoid model is compared on its
// top label too). The CI gates and their exit codes are defined here, the CLI only maps them.

import type { Model } from "../../runtime/model/model.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import { scoreTexts, type LabelledText } from "./evaluate.ts";
import { computeClassificationMetrics, mcnemarTest, type McNemarResult } from "../metrics/index.ts";

import { COMPARE_EXIT_CODES } from "./compare-exit-codes.ts";

export { COMPARE_EXIT_CODES };

/** Significance level of --require-better. */
export const SIGNIFICANCE_LEVEL = 0.05;

/** Thrown when the two models do not predict the same labels. */
export class LabelSetMismatchError extends Error {
  readonly onlyInLive: string[];
  readonly onlyInCandidate: string[];
  constructor(onlyInLive: string[], onlyInCandidate: string[]) {
    const parts: string[] = [];
    if (onlyInLive.length > 0) parts.push(`only the live model has ${onlyInLive.map((l) => JSON.stringify(l)).join(", ")}`);
    if (onlyInCandidate.length > 0) parts.push(`only the candidate has ${onlyInCandidate.map((l) => JSON.stringify(l)).join(", ")}`);
    super(`the two models have different label sets: ${parts.join("; ")}; compare needs models of the same labels`);
    this.name = "LabelSetMismatchError";
    this.onlyInLive = onlyInLive;
    this.onlyInCandidate = onlyInCandidate;
  }
}

/** Quality of one model on the compared examples. */
export interface ModelQuality {
  accuracy: number;
  macroF1: number;
  /** F1 per label. */
  labels: Record<string, number>;
}

/** Paired results over gold label indices. Flip lists hold example positions. */
export interface PredictionComparison {
  live: ModelQuality;
  candidate: ModelQuality;
  /** candidate − live. */
  delta: ModelQuality;
  /** b = live right & candidate wrong, c = live wrong & candidate right. */
  mcnemar: McNemarResult;
  flips: {
    /** Live wrong, candidate right (the c examples). */
    fixed: number[];
    /** Live right, candidate wrong (the b examples). */
    broken: number[];
    /** Both wrong, with different labels. */
    changed: number[];
  };
}

/** One example whose predicted label differs between the models. */
export interface FlippedExample {
  /** 1-based line in the data file when known, else the 1-based position in the data. */
  line: number;
  text: string;
  gold: string;
  live: { label: string; score: number };
  candidate: { label: string; score: number };
}

export interface FlipGroup {
  count: number;
  /** The first `keep` of them, in data order. */
  examples: FlippedExample[];
}

export interface ModelComparison extends Omit<PredictionComparison, "flips"> {
  examples: number;
  labels: string[];
  contentIds: { live: string; candidate: string };
  flips: { fixed: FlipGroup; broken: FlipGroup; changed: FlipGroup };
  /** Examples with a gold label the models do not know (left out). */
  unknownLabelExamples: number;
  unknownLabels: string[];
}

/**
 * Compares two label-index predictions of the same gold labels.
 * @example comparePredictions([0, 1, 1], [0, 0, 1], [0, 1, 0], ["ham", "spam"]).mcnemar // { b: 1, c: 1, … }
 */
export function comparePredictions(gold: ArrayLike<number>, live: ArrayLike<number>, candidate: ArrayLike<number>, labels: readonly string[]): PredictionComparison {
  if (live.length !== gold.length || candidate.length !== gold.length) {
    throw new Error(`comparePredictions: gold has ${gold.length} entries, live ${live.length}, candidate ${candidate.length}; expected one per example in each`);
  }
  const fixed: number[] = [];
  const broken: number[] = [];
  const changed: number[] = [];
  for (let i = 0; i < gold.length; i++) {
    if (live[i] === candidate[i]) continue;
    if (live[i] === gold[i]) broken.push(i);
    else if (candidate[i] === gold[i]) fixed.push(i);
    else changed.push(i);
  }
  const liveQuality = qualityOf(gold, live, labels);
  const candidateQuality = qualityOf(gold, candidate, labels);
  return {
    live: liveQuality,
    candidate: candidateQuality,
    delta: {
      accuracy: candidateQuality.accuracy - liveQuality.accuracy,
      macroF1: candidateQuality.macroF1 - liveQuality.macroF1,
      labels: Object.fromEntries(labels.map((label) => [label, candidateQuality.labels[label] - liveQuality.labels[label]])),
    },
    mcnemar: mcnemarTest(broken.length, fixed.length),
    flips: { fixed, broken, changed },
  };
}

/**
 * Scores the examples with both models and compares them; keeps the first `keep` examples of
 * each flip group (default 50). Throws LabelSetMismatchError when the label sets differ.
 * @example compareModels(live, candidate, examples).mcnemar.pValue
 */
export function compareModels(live: Model, candidate: Model, examples: readonly (LabelledText & { line?: number })[], keep = 50): ModelComparison {
  const labels = [...live.labels];
  const candidateLabels = new Set(candidate.labels);
  const liveLabels = new Set(labels);
  const onlyInLive = labels.filter((l) => !candidateLabels.has(l));
  const onlyInCandidate = candidate.labels.filter((l) => !liveLabels.has(l));
  if (onlyInLive.length > 0 || onlyInCandidate.length > 0) throw new LabelSetMismatchError(onlyInLive, onlyInCandidate);

  const index = new Map(labels.map((label, i) => [label, i]));
  const unknown = new Set<string>();
  const kept: number[] = [];
  examples.forEach((example, i) => {
    if (index.has(example.labels[0])) kept.push(i);
    else unknown.add(example.labels[0]);
  });
  const texts = kept.map((i) => examples[i].text);
  const liveTop = topLabels(live, texts, index);
  const candidateTop = topLabels(candidate, texts, index);
  const gold = Int32Array.from(kept, (i) => index.get(examples[i].labels[0]) as number);
  const paired = comparePredictions(gold, liveTop.label, candidateTop.label, labels);
  const group = (positions: number[]): FlipGroup => ({
    count: positions.length,
    examples: positions.slice(0, keep).map((n) => {
      const example = examples[kept[n]];
      return {
        line: example.line ?? kept[n] + 1,
        text: example.text,
        gold: labels[gold[n]],
        live: { label: labels[liveTop.label[n]], score: liveTop.score[n] },
        candidate: { label: labels[candidateTop.label[n]], score: candidateTop.score[n] },
      };
    }),
  });
  return {
    examples: kept.length,
    labels,
    contentIds: { live: live.meta.contentId, candidate: candidate.meta.contentId },
    live: paired.live,
    candidate: paired.candidate,
    delta: paired.delta,
    mcnemar: paired.mcnemar,
    flips: { fixed: group(paired.flips.fixed), broken: group(paired.flips.broken), changed: group(paired.flips.changed) },
    unknownLabelExamples: examples.length - kept.length,
    unknownLabels: [...unknown].sort(),
  };
}

/** Which gates to apply (the CLI flags). */
export interface CompareGates {
  requireBetter: boolean;
  /** Largest allowed drop of `metric` (absolute, e.g. 0.01), or null for no limit. */
  maxRegression: number | null;
  metric: "accuracy" | "macro-f1";
}

/** The gates' verdict: the exit code and one line per gate. */
export interface GateVerdict {
  exitCode: (typeof COMPARE_EXIT_CODES)[keyof typeof COMPARE_EXIT_CODES];
  lines: string[];
}

// Deltas are differences of ratios: 0.96 − 0.97 is −0.01000000000000001 in doubles, which must
// not fail a --max-regression 0.01 gate.
const ROUNDING_SLACK = 1e-12;

/**
 * Applies the gates; a regression (exit 4) outranks "not significantly better" (exit 3).
 * @example checkGates(comparison, { requireBetter: true, maxRegression: null, metric: "accuracy" }).exitCode // 0 or 3
 */
export function checkGates(comparison: Pick<ModelComparison, "delta" | "mcnemar">, gates: CompareGates): GateVerdict {
  const lines: string[] = [];
  let regression = false;
  let notBetter = false;
  if (gates.maxRegression !== null) {
    const delta = gates.metric === "accuracy" ? comparison.delta.accuracy : comparison.delta.macroF1;
    const name = gates.metric === "accuracy" ? "accuracy" : "macro-F1";
    regression = -delta > gates.maxRegression + ROUNDING_SLACK;
    lines.push(`--max-regression ${gates.maxRegression}: ${name} ${signed(delta)} ${regression ? `drops by more than ${gates.maxRegression}: FAIL (exit ${COMPARE_EXIT_CODES.regression})` : "is within the limit: pass"}`);
  }
  if (gates.requireBetter) {
    const { b, c, pValue } = comparison.mcnemar;
    notBetter = !(pValue < SIGNIFICANCE_LEVEL && c > b);
    const reason = c <= b ? `c = ${c} ≤ b = ${b}` : `p = ${formatP(pValue)} ≥ ${SIGNIFICANCE_LEVEL}`;
    lines.push(`--require-better: ${notBetter ? `not significantly better (${reason}): FAIL (exit ${COMPARE_EXIT_CODES.notBetter})` : `significantly better (c = ${c} > b = ${b}, p = ${formatP(pValue)}): pass`}`);
  }
  const exitCode = regression ? COMPARE_EXIT_CODES.regression : notBetter ? COMPARE_EXIT_CODES.notBetter : COMPARE_EXIT_CODES.pass;
  return { exitCode, lines };
}

function qualityOf(gold: ArrayLike<number>, predicted: ArrayLike<number>, labels: readonly string[]): ModelQuality {
  const metrics = computeClassificationMetrics(gold, predicted, labels.length, labels);
  return { accuracy: metrics.accuracy, macroF1: metrics.macroF1, labels: Object.fromEntries(labels.map((label) => [label, metrics.labels[label].f1])) };
}

/** Top label of each text as an index into the live model's labels, and its score. */
function topLabels(model: Model, texts: string[], index: Map<string, number>): { label: Int32Array; score: Float32Array } {
  const set = scoreTexts(model, texts);
  const k = set.labelCount;
  const label = new Int32Array(texts.length);
  const score = new Float32Array(texts.length);
  for (let i = 0; i < texts.length; i++) {
    const best = topLabel(set.scores, i * k, k);
    label[i] = index.get(model.labels[best]) as number;
    score[i] = set.scores[i * k + best];
  }
  return { label, score };
}

/** +0.012 / −0.004 style. */
export function signed(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return "n/a";
  const text = Math.abs(value).toFixed(digits);
  return value < 0 && Number(text) !== 0 ? `-${text}` : `+${text}`;
}

/** A p-value for people: 4 significant digits, scientific below 0.0001. */
export function formatP(p: number): string {
  return p < 1e-4 ? p.toExponential(2) : p.toPrecision(4).replace(/\.?0+$/, "") || "0";
}
