// The settings `sluice tune` searches, and how a trial's settings are drawn from them.
// Ranges follow what measurably matters for this model family on our data: width, n-gram
// spans, hash size, rare-feature cut-off, weighting, epochs and learning rate; the pruning
// budget comes from --max-bytes, which every trial is compiled under.

import { defaultBuildSettings, type BuildSettings } from "../build/build-settings.ts";
import type { RandomSource } from "../train/random.ts";

const DIMS = [8, 12, 16, 24, 32, 48];
const WORD_SPANS = [1, 2, 3];
const CHAR_SPANS: [number, number][] = [[0, 0], [2, 4], [3, 4], [3, 5], [3, 6]];
const HASH_BITS = [16, 17, 18, 19, 20, 21, 22];
const MIN_DOCS = [1, 2, 3, 5];
const WEIGHTINGS: BuildSettings["weighting"][] = ["mean", "tfidf"];

function pick<T>(values: readonly T[], random: RandomSource): T {
  return values[Math.floor(random.next() * values.length)];
}

/**
 * One random point of the search space on top of `base` (which keeps head, threads, seed,
 * size budget and policy targets).
 * @example sampleSettings(defaultBuildSettings(), createRandom(1)).dims
 */
export function sampleSettings(base: BuildSettings, random: RandomSource): BuildSettings {
  return {
    ...base,
    dims: pick(DIMS, random),
    wordSpan: pick(WORD_SPANS, random),
    charSpan: pick(CHAR_SPANS, random),
    hashBits: pick(HASH_BITS, random),
    minDocs: pick(MIN_DOCS, random),
    weighting: pick(WEIGHTINGS, random),
    epochs: 4 + Math.floor(random.next() * 22),
    // Log-uniform in [0.1, 1.0]: the useful rates span an order of magnitude.
    learningRate: Math.round(10 ** (-1 + random.next()) * 1000) / 1000,
  };
}

/** The default settings with the tune's fixed choices applied (the baseline trial). */
export function baselineSettings(base: BuildSettings): BuildSettings {
  const defaults = defaultBuildSettings();
  return { ...base, dims: defaults.dims, wordSpan: defaults.wordSpan, charSpan: defaults.charSpan, hashBits: defaults.hashBits, minDocs: defaults.minDocs, weighting: defaults.weighting, epochs: defaults.epochs, learningRate: defaults.learningRate };
}

/** The searched keys of a settings object (what the config file records). */
export function searchedSettings(settings: BuildSettings): Partial<BuildSettings> {
  const { dims, wordSpan, charSpan, hashBits, minDocs, weighting, epochs, learningRate, maxBytes, head } = settings;
  return { dims, wordSpan, charSpan, hashBits, minDocs, weighting, epochs, learningRate, maxBytes, head };
}

/**
 * Smallest file any model with these settings can be: header plus output layer, no rows.
 * A trial whose floor exceeds the budget is never run.
 */
export function sizeFloor(settings: BuildSettings, labelCount: number): number {
  const outputs = settings.head === "tree" ? labelCount - 1 : labelCount;
  const perOutput = settings.precision === "int8" ? settings.dims + 8 : settings.dims * 4 + 4;
  return 2048 + 32 * labelCount + outputs * perOutput;
}
