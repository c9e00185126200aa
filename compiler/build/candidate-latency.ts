// How fast a candidate of the build's setting search classifies, and when that rules it out.
// The search trains float drafts, but what ships is compiled (pruned to the size budget,
// quantized, logit rows when they apply) and served by the runtime, whose word cache makes
// character n-grams cost far less than scoring a draft suggests. So each candidate is compiled
// the quick way (no output-layer fine-tuning or calibration: they change values, not cost),
// loaded, and timed with the build's own latency measurement (measureLatency). The rule, a
// rule of this project (speed is what users came for): a candidate more than SLOWDOWN_LIMIT
// times slower than word-only must gain at least SLOW_CANDIDATE_GAIN of validation macro-F1,
// and one slower than --max-us is never chosen.

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

/** What the rule reads of a candidate: its classify time and its validation macro-F1. */
export interface TimedCandidate {
  /** µs per classify call of the 300-token validation text, compiled model (candidateMicroseconds). */
  microseconds: number;
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
 * Why the search must not choose `candidate` for its speed, or null: slower than `maxUs` (when
 * set), or more than SLOWDOWN_LIMIT × `wordOnly`'s time without SLOW_CANDIDATE_GAIN more
 * macro-F1 than `wordOnly`. The search asks only about a candidate that beats the best so far.
 * @example latencyProblem({ microseconds: 90, macroF1: 0.95 }, { microseconds: 30, macroF1: 0.945 }, 0) // "3.0× slower than words only …"
 */
export function latencyProblem(candidate: TimedCandidate, wordOnly: TimedCandidate | null, maxUs: number): string | null {
  if (maxUs > 0 && candidate.microseconds > maxUs) return `${candidate.microseconds.toFixed(1)} µs for 300 tokens is above --max-us ${maxUs}`;
  if (wordOnly === null || wordOnly === candidate || !(wordOnly.microseconds > 0)) return null;
  const slowdown = candidate.microseconds / wordOnly.microseconds;
  if (slowdown > SLOWDOWN_LIMIT && candidate.macroF1 - wordOnly.macroF1 < SLOW_CANDIDATE_GAIN) {
    return `${slowdown.toFixed(1)}× slower than words only for less than ${SLOW_CANDIDATE_GAIN * 100} point of macro-F1 over it`;
  }
  return null;
}
