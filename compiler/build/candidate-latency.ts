// How fast a candidate of the build's setting search would serve, and when that rules it out.
// A rule of this project (speed is what users came for): a candidate more than SLOWDOWN_LIMIT
// times slower than words only must gain at least SLOW_CANDIDATE_GAIN of validation macro-F1,
// and one slower than --max-us is never chosen.
//
// "Slower" for the first part is counted, not timed, so a busy machine cannot change a seed's
// choice: servingWork counts what the runtime does per validation text, with its word cache
// (a word's features are summed once, then reused), which makes character n-grams cost far less
// than their feature count suggests. --max-us is a time the user asked for on this machine, so
// it is timed: each candidate is compiled the quick way (pruned to the budget, quantized, logit
// rows when they apply; no output-layer fine-tuning or calibration, which change values, not
// cost), loaded, and measured with the build's latency measurement (measureLatency).

import { createFeatureBuffer, createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import { charCodesToString } from "../../runtime/featurizer/char-codes-to-string.ts";
import { WORD } from "../../runtime/featurizer/token-kinds.ts";
import { LONGEST_CACHED_WORD } from "../../runtime/model/word-feature-cache.ts";
import { loadModel } from "../../runtime/format/load-model.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import { shouldFoldOutput } from "../compile/fold-output.ts";
import { rankRows, rowImportance, selectRows, subsetDraft } from "../compile/prune.ts";
import { writeModel } from "../compile/write-model.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { measureLatency } from "../evaluate/measure-latency.ts";
import type { Draft } from "../train/draft.ts";
import type { HeaderBase } from "./base-header.ts";
import { featurizerSettingsOf } from "./base-header.ts";
import type { BuildSettings } from "./build-settings.ts";
import { contentsOf } from "./draft-contents.ts";

/** A slower candidate (more than SLOWDOWN_LIMIT × the word-only time) must gain this much macro-F1. */
export const SLOW_CANDIDATE_GAIN = 0.01;
export const SLOWDOWN_LIMIT = 2;

/** What the rule reads of a candidate. */
export interface TimedCandidate {
  /** CPU µs per classify call of the 300-token validation text, compiled model (candidateMicroseconds). */
  microseconds: number;
  /** Serving work per validation text (servingWork). */
  workPerText: number;
  macroF1: number;
}

/**
 * µs per `classify` call of a 300-token text cut from the validation texts, with the draft
 * compiled as the build would ship it: its `keep` most important rows, in the build's precision,
 * with logit rows when they apply (the build's latency report measures the same text).
 * @example candidateMicroseconds(draft, settings, "softmax", draft.slots.length, validation) // 24.1
 */
export function candidateMicroseconds(draft: Draft, settings: BuildSettings, head: HeadKind, keep: number, validation: readonly LabelledText[]): number {
  if (validation.length === 0) return 0;
  const kept = keep < draft.slots.length ? subsetDraft(draft, selectRows(rankRows(rowImportance(draft)), keep)) : draft;
  const header: HeaderBase = {
    labels: draft.labels,
    head,
    dims: draft.dims,
    rowSpace: "hidden",
    outputCount: draft.outputCount,
    featurizer: featurizerSettingsOf(settings),
    weighting: settings.weighting,
    precision: settings.precision,
    calibration: { temperature: 1 },
    thresholds: null,
    policy: null,
    metrics: {},
    provenance: {},
  };
  const rowSpace = shouldFoldOutput(settings.foldOutput, head, draft.outputCount, draft.dims) ? "logits" : "hidden";
  const model = loadModel(writeModel(contentsOf(kept, header, settings.precision, null, rowSpace)));
  return measureLatency(model, validation.map((e) => e.text)).tokens300.microseconds;
}

/**
 * Multiply-adds per validation text of the compiled model as the runtime scores it, in one pass
 * over the texts with a fresh word cache: each feature outside words (word pairs, numbers,
 * marks, URLs) reads one row; with character n-grams each word adds one cached sum, and the
 * first time a word is met its own row and every one of its character n-grams are read; without
 * them each word reads its row. Rows are `width` wide (the label count for logit rows, else
 * dims), and hidden rows then pass the output layer (every output row, or about two per level
 * of the label tree). Counted from the featurizer, so it is the same on every machine. The
 * count assumes the cache keeps every word it met (it holds 4096, so a validation set with a
 * larger vocabulary costs a little more than counted).
 * @example servingWork(settings, "softmax", 6, validation) // 850
 */
export function servingWork(settings: BuildSettings, head: HeadKind, labelCount: number, validation: readonly LabelledText[]): number {
  if (validation.length === 0) return 0;
  const featurizer = createFeaturizer(featurizerSettingsOf(settings));
  const cached = settings.charSpan[0] > 0; // as Model: the word cache serves models with character n-grams
  const buffer = createFeatureBuffer();
  const word = createFeatureBuffer();
  const seen = new Set<string>();
  let rows = 0;
  for (const { text } of validation) {
    featurizer.featurize(text, buffer, cached);
    rows += buffer.count;
    if (!cached) continue;
    const tokens = featurizer.tokens;
    for (let t = 0; t < tokens.tokenTotal; t++) {
      if (tokens.tokenKinds[t] !== WORD) continue;
      rows++;
      const first = tokens.tokenCharStart[t];
      const key = charCodesToString(tokens.wordChars, first, tokens.tokenCharEnd[t]);
      if (seen.has(key)) continue;
      if (key.length <= LONGEST_CACHED_WORD) seen.add(key); // longer words are summed every time
      word.count = 0;
      featurizer.wordFeatures(t, word);
      rows += word.count;
    }
  }
  const outputs = head === "tree" ? labelCount - 1 : labelCount;
  const logitRows = shouldFoldOutput(settings.foldOutput, head, outputs, settings.dims);
  const outputWork = logitRows ? 0 : (head === "tree" ? 2 * Math.ceil(Math.log2(Math.max(2, labelCount))) : outputs) * settings.dims;
  return (rows / validation.length) * (logitRows ? outputs : settings.dims) + outputWork;
}

/**
 * Why the search must not choose `candidate` for its speed, or null: slower than `maxUs` µs
 * (when set), or more than SLOWDOWN_LIMIT × `wordOnly`'s serving work without
 * SLOW_CANDIDATE_GAIN more macro-F1 than `wordOnly`. The search asks only about a candidate that
 * beats the best so far.
 * @example latencyProblem({ microseconds: 90, workPerText: 3000, macroF1: 0.95 }, { microseconds: 30, workPerText: 1000, macroF1: 0.945 }, 0) // "3.0× the serving work of words only …"
 */
export function latencyProblem(candidate: TimedCandidate, wordOnly: TimedCandidate | null, maxUs: number): string | null {
  if (maxUs > 0 && candidate.microseconds > maxUs) return `${candidate.microseconds.toFixed(1)} µs for 300 tokens is above --max-us ${maxUs}`;
  if (wordOnly === null || wordOnly === candidate || !(wordOnly.workPerText > 0)) return null;
  const slowdown = candidate.workPerText / wordOnly.workPerText;
  if (slowdown > SLOWDOWN_LIMIT && candidate.macroF1 - wordOnly.macroF1 < SLOW_CANDIDATE_GAIN) {
    return `${slowdown.toFixed(1)}× the serving work of words only for less than ${SLOW_CANDIDATE_GAIN * 100} point of macro-F1 over it`;
  }
  return null;
}
