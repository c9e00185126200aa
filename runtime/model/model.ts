// A loaded model: scores texts from typed-array views over the model file.
// The model is linear up to the output nonlinearity:
//   hidden = Σ_f w_f · row_f / Σ_f w_f          (w_f = 1, or the row's IDF under TF-IDF)
//   logit_k = (outputScale_k · Σ_j out_kj · hidden_j + bias_k) / temperature
// so every logit splits exactly into per-feature contributions plus the bias (explain).
// With "logits" rows the compiler has multiplied the output layer into the rows, so
//   logit_k = (Σ_f w_f · row_f[k] / Σ_f w_f + bias_k) / temperature
// and a feature costs one multiply-add per label instead of one per embedding dimension.

import { SURFACE_DEFAULTS } from "../surface-defaults.ts";
import { InputError } from "../errors.ts";
import { createFeatureBuffer, createFeaturizer, type FeatureBuffer, type Featurizer } from "../featurizer/featurizer.ts";
import { explainLabels, type ScoredFeatures } from "./explain-labels.ts";
import { decideFromScores, failClosed, type Decision } from "./policy.ts";
import { LabelTree, type NodeScorer } from "./label-tree.ts";
import type { ClassifyOptions, DecideOptions, Explanation, LabelScore, ModelMeta, ModelParts, ScoreResult } from "./model-types.ts";
import { rankLabels } from "./rank-labels.ts";
import { accumulateFloat, accumulateInt8, accumulateLogitRowsInt8, logitsFloat, logitsInt8 } from "./scoring-kernels.ts";
import { WordFeatureCache, type RowSummer } from "./word-feature-cache.ts";

export type { ClassifyOptions, DecideOptions, Explanation, FeatureContribution, LabelExplanation, LabelScore, ModelMeta, ModelParts, ScoreResult } from "./model-types.ts";


export class Model implements NodeScorer, RowSummer {
  readonly meta: ModelMeta;
  readonly labels: readonly string[];
  readonly parts: ModelParts;
  readonly featurizer: Featurizer;
  private readonly buffer: FeatureBuffer;
  /** The features of the text decide or explain read last, with their origins (see readText). */
  private readonly readBuffer: FeatureBuffer;
  private readonly hidden: Float64Array;
  /** Scratch of the last scoring call. */
  private readonly logits: Float64Array;
  private readonly scores: Float32Array;
  readonly tree: LabelTree | null;
  private readonly topLabelScratch: Int32Array;
  private readonly topProbabilityScratch: Float64Array;
  private lastTokenCount = 0;
  private lastTruncated = false;
  private lastKnown = 0;
  private lastWeight = 0;
  /**
   * Row sums by word, for models with character n-grams (else null); see word-feature-cache.ts.
   * Tests and benchmarks set it to null to look every feature of every word up on each call.
   */
  wordCache: WordFeatureCache | null;

  constructor(parts: ModelParts) {
    const header = parts.header;
    this.parts = parts;
    this.labels = header.labels;
    this.featurizer = createFeaturizer(header.featurizer);
    this.buffer = createFeatureBuffer(1024);
    this.readBuffer = createFeatureBuffer(1024, "origins");
    this.hidden = new Float64Array(header.dims);
    this.logits = new Float64Array(header.outputCount);
    this.scores = new Float32Array(header.labels.length);
    this.tree = parts.tree ? new LabelTree(parts.tree, header.labels.length) : null;
    this.wordCache = header.featurizer.charMin > 0 ? new WordFeatureCache(header.rowSpace === "logits" ? header.outputCount : header.dims) : null;
    this.topLabelScratch = new Int32Array(header.labels.length);
    this.topProbabilityScratch = new Float64Array(header.labels.length);
    this.meta = {
      contentId: parts.contentId,
      bytes: parts.byteLength,
      labels: [...header.labels],
      head: header.head,
      dims: header.dims,
      rowSpace: header.rowSpace,
      rowCount: header.rowCount,
      precision: header.precision,
      weighting: header.weighting,
      featurizer: { ...header.featurizer },
      calibration: { ...header.calibration },
      thresholds: header.thresholds ? [...header.thresholds] : null,
      policy: header.policy,
      metrics: header.metrics,
      provenance: header.provenance,
    };
  }

  /**
   * Labels and scores, best first.
   * @example model.classify("my card was charged twice", { top: 2 }) // [{ label: "billing", score: 0.93 }, …]
   */
  classify(text: string, options: ClassifyOptions = {}): LabelScore[] {
    checkText(text);
    const minScore = options.minScore ?? 0;
    if (options.top !== undefined && (!Number.isInteger(options.top) || options.top < 1)) {
      throw new InputError("bad-option", `top must be a positive integer, got ${String(options.top)}`);
    }
    if (this.tree !== null && (options.top ?? 1) < this.labels.length) return this.classifyTree(text, options.top ?? 1, minScore);
    const scores = this.scoreText(text);
    const thresholds = this.parts.header.thresholds;
    const useThresholds = options.top === undefined && this.parts.header.head === "sigmoid";
    const top = options.top ?? (useThresholds ? scores.length : 1);
    const order = rankLabels(scores, top);
    const result: LabelScore[] = [];
    for (const k of order) {
      if (scores[k] < minScore) continue;
      if (useThresholds && scores[k] < (thresholds ? thresholds[k] : 0.5)) continue;
      result.push({ label: this.labels[k], score: scores[k] });
    }
    return result;
  }

  /**
   * All label scores of a text (a fresh array, in label order) and what the featurizer saw.
   * @example model.score("hello").scores[0]
   */
  score(text: string): ScoreResult {
    checkText(text);
    const scores = this.scoreText(text).slice();
    return { scores, tokenCount: this.lastTokenCount, truncated: this.lastTruncated, knownFeatures: this.lastKnown };
  }

  /**
   * Writes all label scores into `out` (length = label count) without allocating.
   * For evaluation loops; returns `out`.
   */
  scoreInto(text: string, out: Float32Array): Float32Array {
    out.set(this.scoreText(text));
    return out;
  }

  /**
   * The decision of the model's policy for a text, with reasons (rules that fired and
   * the features that pushed the label). Without a policy the action is "allow", or "review"
   * below `options.reviewBelow`, the caller's review floor (the higher of it and the policy's
   * own floor applies; it never blocks). Never throws for a string: a non-finite score or any
   * error on the way gives "review" with `fault` set (see failClosed).
   * @example model.decide("WIN A FREE PRIZE") // { action: "review", label: "spam", score: 0.81, reasons: [...] }
   * @example model.decide("hello?", { reviewBelow: 0.6 }) // { action: "review", label: "ok", score: 0.52, reasons: [...] }
   */
  decide(text: string, options: DecideOptions = {}): Decision {
    checkText(text);
    // Fail closed: whatever goes wrong past the caller's own mistake (not a string) is "review".
    try {
      return this.decideChecked(text, options);
    } catch (error) {
      return failClosed("decision-error", error instanceof Error ? `${error.name}: ${error.message}` : String(error));
    }
  }

  private decideChecked(text: string, options: DecideOptions): Decision {
    // Without a policy every decision names its drivers, so the text is read once, with
    // origins. With one, most texts are allowed and need no names: they take the fast path
    // (with the word cache; reading with origins costs about 2× featurizing), and only a block
    // or review reads the text a second time, with origins, to name what pushed it.
    const alwaysExplained = this.parts.header.policy === null;
    const scores = alwaysExplained ? this.readText(text) : this.scoreText(text);
    const decision = decideFromScores(this.parts.header.policy, this.labels, scores, options.reviewBelow ?? 0);
    if (decision.fault !== undefined) return decision;
    if (this.lastKnown === 0) decision.reasons.push("no known feature in the text: the score is the model's prior");
    if (decision.action !== "allow" || alwaysExplained) {
      const scored = alwaysExplained ? scores : this.readText(text);
      const explanation = explainLabels(this.readFeatures(scored), [this.labels.indexOf(decision.label)], 3);
      const drivers = explanation.labels[0]?.features.filter((f) => f.contribution > 0) ?? [];
      if (drivers.length > 0) decision.reasons.push(`pushed by ${drivers.map((f) => `"${f.feature}" (+${f.contribution.toFixed(2)})`).join(", ")}`);
    }
    if (this.lastTruncated) decision.reasons.push(`only the first ${this.parts.header.featurizer.maxTokens} tokens were read`);
    return decision;
  }

  /**
   * For each top label, the features with the largest exact contributions to its logit.
   * @example model.explain("refund my order", { top: 1 }).labels[0].features[0] // { feature: "refund", contribution: 1.7 }
   */
  explain(text: string, options: { top?: number; features?: number } = {}): Explanation {
    checkText(text);
    const scores = this.readText(text);
    const order = rankLabels(scores, options.top ?? SURFACE_DEFAULTS.explainTop);
    return explainLabels(this.readFeatures(scores), order, options.features ?? SURFACE_DEFAULTS.explainFeatures);
  }

  /** What explainLabels needs of the text readText just scored: its features and scores. */
  private readFeatures(scores: Float32Array): ScoredFeatures {
    return { parts: this.parts, featurizer: this.featurizer, tree: this.tree, buffer: this.readBuffer, scores, logits: this.logits };
  }

  // ---- scoring ---------------------------------------------------------------------

  /** Tree head, top k: best-first search, scoring only the inner nodes it visits. */
  private classifyTree(text: string, top: number, minScore: number): LabelScore[] {
    this.meanOfRows(text, this.hidden);
    const found = (this.tree as LabelTree).topLabels(top, this, this.topLabelScratch, this.topProbabilityScratch);
    const result: LabelScore[] = [];
    for (let i = 0; i < found; i++) {
      const score = Math.fround(this.topProbabilityScratch[i]);
      if (score >= minScore) result.push({ label: this.labels[this.topLabelScratch[i]], score });
    }
    return result;
  }

  /** One output row's temperature-scaled logit from the current hidden vector (tree search). */
  nodeLogit(output: number): number {
    const { outputScales, outputBias } = this.parts;
    const outputWeights = this.parts.outputWeights as Int8Array | Float32Array; // a tree head's rows are always hidden-space
    const dims = this.hidden.length;
    const hidden = this.hidden;
    const base = output * dims;
    let sum = 0;
    for (let j = 0; j < dims; j++) sum += outputWeights[base + j] * hidden[j];
    const scale = outputScales === null ? 1 : outputScales[output];
    return (scale * sum + outputBias[output]) / this.parts.header.calibration.temperature;
  }

  /** Scores of `text` in the shared scratch array (valid until the next call); the fast path. */
  private scoreText(text: string): Float32Array {
    const target = this.parts.header.rowSpace === "logits" ? this.logits : this.hidden;
    this.sumFeatures(text, target);
    return this.scoresOfSum(target);
  }

  /**
   * Scores of `text` like scoreText, read in one featurize call that keeps every feature and
   * its origin in readBuffer, so a decision or explanation names its drivers from the very
   * features it was scored with (the word cache is not used: it leaves words out of the buffer).
   */
  private readText(text: string): Float32Array {
    const target = this.parts.header.rowSpace === "logits" ? this.logits : this.hidden;
    this.featurizer.featurize(text, this.readBuffer);
    this.sumBuffer(this.readBuffer, target);
    return this.scoresOfSum(target);
  }

  /** From Σ weight · row (in logits or hidden, lastWeight set): the mean, the logits and the scores. */
  private scoresOfSum(sum: Float64Array): Float32Array {
    this.divideByWeight(sum);
    if (this.parts.header.rowSpace === "logits") {
      // Logit rows: the mean of the known features' rows is the logit vector, before bias and temperature.
      const logits = this.logits;
      const inverseTemperature = 1 / this.parts.header.calibration.temperature;
      const bias = this.parts.outputBias;
      for (let k = 0; k < logits.length; k++) logits[k] = (logits[k] + bias[k]) * inverseTemperature;
    } else {
      this.computeLogits();
    }
    this.computeScores();
    return this.scores;
  }

  /** out = the weighted mean of the rows of the known features of `text` (zero when none is known). */
  private meanOfRows(text: string, out: Float64Array): void {
    this.sumFeatures(text, out);
    this.divideByWeight(out);
  }

  private divideByWeight(sum: Float64Array): void {
    if (this.lastWeight <= 0) return;
    const inverse = 1 / this.lastWeight;
    for (let j = 0; j < sum.length; j++) sum[j] *= inverse;
  }

  /**
   * out = Σ weight · row over the known features of `text` (not yet divided by the total
   * weight, which is left in lastWeight). With character n-grams, words come from the word cache.
   */
  private sumFeatures(text: string, out: Float64Array): void {
    const wordCache = this.wordCache;
    this.featurizer.featurize(text, this.buffer, wordCache !== null);
    this.sumBuffer(this.buffer, out);
    if (wordCache !== null) {
      wordCache.addWords(this.featurizer, this, out, this.buffer); // the text's features are summed: its buffer is free
      this.lastKnown += wordCache.known;
      this.lastWeight += wordCache.weight;
    }
  }

  /** out = Σ weight · row over the buffer's known features; notes what the featurizer saw. */
  private sumBuffer(buffer: FeatureBuffer, out: Float64Array): void {
    this.lastTokenCount = buffer.tokenCount;
    this.lastTruncated = buffer.truncated;
    out.fill(0);
    const totals = this.sumRows(buffer.slots, buffer.count, out);
    this.lastKnown = totals.known;
    this.lastWeight = totals.weight;
  }

  /** Adds the rows of `slots` into `out`, which starts at zero (RowSummer, for the word cache too). */
  sumRows(slots: Uint32Array, count: number, out: Float64Array): { known: number; weight: number } {
    const { index, rows, rowScales, rowWeights } = this.parts;
    // One loop per storage type keeps each loop's typed-array reads monomorphic even when a
    // process holds int8 and float32 models at once (the compiler does).
    if (!(rows instanceof Int8Array)) return accumulateFloat(index, rows, rowWeights, slots, count, out);
    return this.parts.header.rowSpace === "logits"
      ? accumulateLogitRowsInt8(index, rows, rowScales as Float32Array, rowWeights, slots, count, out)
      : accumulateInt8(index, rows, rowScales as Float32Array, rowWeights, slots, count, out);
  }

  private computeLogits(): void {
    const { outputScales, outputBias } = this.parts;
    const outputWeights = this.parts.outputWeights as Int8Array | Float32Array; // only called for hidden-space rows
    const inverseTemperature = 1 / this.parts.header.calibration.temperature;
    if (outputWeights instanceof Int8Array) logitsInt8(outputWeights, outputScales as Float32Array, outputBias, this.hidden, inverseTemperature, this.logits);
    else logitsFloat(outputWeights, outputBias, this.hidden, inverseTemperature, this.logits);
  }

  private computeScores(): void {
    const logits = this.logits;
    const scores = this.scores;
    const head = this.parts.header.head;
    if (head === "softmax") {
      let max = -Infinity;
      for (let k = 0; k < logits.length; k++) if (logits[k] > max) max = logits[k];
      let sum = 0;
      for (let k = 0; k < logits.length; k++) sum += Math.exp(logits[k] - max);
      for (let k = 0; k < logits.length; k++) scores[k] = Math.exp(logits[k] - max) / sum;
    } else if (head === "sigmoid") {
      for (let k = 0; k < logits.length; k++) scores[k] = 1 / (1 + Math.exp(-logits[k]));
    } else {
      (this.tree as LabelTree).labelProbabilities(logits, scores);
    }
  }
}

function checkText(text: unknown): void {
  if (typeof text !== "string") throw new InputError("not-text", `expected the text as a string, got ${text === null ? "null" : typeof text}`);
}
