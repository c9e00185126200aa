// Every build setting in one typed table: the CLI flags, the `sluice.config.json` keys and
// the programmatic defaults all come from here, and a setting without a description does
// not type-check.

import type { SoftmaxLoss } from "../train/draft.ts";

export type HeadChoice = "auto" | "softmax" | "sigmoid" | "tree";

export interface BuildSettings {
  dims: number;
  wordSpan: number;
  /** [shortest, longest] character n-gram; [0, 0] turns them off. */
  charSpan: [number, number];
  hashBits: number;
  hashSeed: number;
  minDocs: number;
  weighting: "mean" | "tfidf";
  head: HeadChoice;
  /** What the softmax head minimizes: the log-likelihood or the multiclass margin (compiler/train/draft.ts, SoftmaxLoss). */
  loss: SoftmaxLoss;
  /** Rows of per-label logits with an identity output layer (dims = the label count): a full-rank linear model. */
  linear: boolean;
  epochs: number;
  learningRate: number;
  /** Per-row adaptive learning rates (row-wise Adagrad) instead of one rate for every row. */
  adaptiveRates: boolean;
  threads: number;
  seed: number;
  holdout: number;
  /** Size budget of the compiled model in bytes (0 = none). */
  maxBytes: number;
  /** Keep at most this many feature rows (0 = no limit). */
  keepFeatures: number;
  precision: "int8" | "float32";
  /** Epochs that retrain the output layer on the pruned, quantized rows. */
  fineTuneEpochs: number;
  /** Multiply the output layer into the rows when there are fewer outputs than dims. */
  foldOutput: boolean;
  maxTokens: number;
  /** Letters of scripts written without spaces (Chinese, Japanese, Thai…) become one token each. */
  unspacedScripts: boolean;
  /** Fold evasions (lookalike letters, leetspeak, spaced, padded and stretched words): the newest normalization (3) instead of 1. */
  foldEvasion: boolean;
  /** Label → precision to reach on validation data (block/route threshold). */
  targetPrecision: Record<string, number>;
  /** Label → recall to reach on validation data. */
  targetRecall: Record<string, number>;
  /** Label → what its rule does when the threshold is reached: "block", "review" or "route:<destination>". */
  actions: Record<string, string>;
  /** Send a text to review when its top score is below this (0 = off). */
  reviewBelow: number;
  /** Fit temperature scaling on the validation split. */
  calibrate: boolean;
  /** Store a Bloom filter of the training texts so `eval` can warn about train/test overlap. */
  fingerprint: boolean;
  /** "together": near-identical texts stay on one side of the validation split (default); "apart": only groups do. */
  nearDuplicates: "together" | "apart";
  /** Seconds the build may spend choosing settings on the validation split ("auto": scaled with the data; 0: no search). */
  searchTime: number | "auto";
  /** The build's search never picks settings whose classify time exceeds this many µs per text (0 = no limit). */
  maxUs: number;
}

type Kind = "int" | "float" | "span" | "size" | "enum" | "map" | "actions" | "boolean" | "seconds";

export interface SettingSpec<K extends keyof BuildSettings> {
  flag: string;
  kind: Kind;
  description: string;
  min?: number;
  max?: number;
  values?: readonly string[];
  default: BuildSettings[K];
  /** The value's placeholder in help (`L=P`); from the kind when absent. */
  placeholder?: string;
  /** The default as help and README show it, when the value alone would mislead (e.g. chosen from the data). */
  defaultText?: string;
}

/** The table. Defaults were picked by measurement on the demo data and the SpamAssassin split (see README). */
export const BUILD_SETTINGS: { [K in keyof BuildSettings]: SettingSpec<K> } = {
  dims: { flag: "--dims", kind: "int", min: 1, max: 512, default: 24, defaultText: "24; 32 above 16 labels, 48 above 64; the search halves it when the size budget prunes", description: "width of the feature embeddings (by default sized to the label count)" },
  wordSpan: { flag: "--word-span", kind: "int", min: 1, max: 4, default: 2, description: "longest word n-gram (1 = words only, 2 = words + pairs)" },
  // Off unless the build's search finds 1-4 better on validation (and worth its cost): on the
  // demo topics, the contact form and SpamAssassin 3-4 character n-grams added at most 0.2
  // points for 3-4x the classify time; on language identification they are most of the signal.
  charSpan: { flag: "--char-span", kind: "span", min: 0, max: 8, default: [0, 0], defaultText: "chosen: 0 (off) or 1-4", description: "character n-gram lengths inside words, A-B (0 = off)" },
  hashBits: { flag: "--hash-bits", kind: "int", min: 10, max: 26, default: 20, description: "size of the hashed feature space, 2^N slots" },
  hashSeed: { flag: "--hash-seed", kind: "int", min: 0, max: 0xffffffff, default: 0, description: "seed of the feature hash" },
  minDocs: { flag: "--min-docs", kind: "int", min: 1, max: 1_000_000, default: 2, description: "ignore features seen in fewer than N training examples" },
  // TF-IDF is where the search starts: in 5-fold cross-validation on the training parts of the
  // demo topics, the contact form and SpamAssassin it beat mean weighting on all three (0.9671
  // vs 0.9619, 0.9684 vs 0.9670, 0.9840 vs 0.9811 accuracy); the search still tries mean.
  weighting: { flag: "--weighting", kind: "enum", values: ["mean", "tfidf"], default: "tfidf", defaultText: "chosen: tfidf or mean", description: "how feature rows are combined: tfidf weighs each row by its inverse document frequency" },
  head: { flag: "--head", kind: "enum", values: ["auto", "softmax", "sigmoid", "tree"], default: "auto", description: "output layer (auto: sigmoid for several labels per example, tree for large label sets, else softmax)" },
  // Logistic with --search-time 0; the search tries the margin loss for the softmax head. On the
  // scikit-learn references' validation splits of the suite's training parts
  // (scripts/bench/learner-lab.ts --reference-split, learning rate 0.2 against 0.5) it lifted
  // float-draft accuracy from 0.416 to 0.447 (library passages, where a linear SVM's 0.488 led
  // logistic regression's 0.414) and from 0.750 to 0.757 (package sections).
  loss: { flag: "--loss", kind: "enum", values: ["logistic", "margin"], default: "logistic", defaultText: "chosen: logistic or margin", description: "what the softmax head is trained to minimize: logistic (log-likelihood) or margin (multiclass hinge: stop pushing a text once its label leads by a margin); scores stay softmax probabilities, calibrated; other heads always use their logistic losses" },
  // Off with --search-time 0; the search tries it for the softmax head. Over 5 grouped validation
  // splits of the library passages' training part (learner-lab.ts --splits 5, margin loss): 0.399
  // accuracy / 0.369 macro-F1 at learning rate 0.2 against 0.373 / 0.341 for 32-wide rows and an output layer.
  linear: { flag: "--linear", kind: "boolean", default: false, defaultText: "chosen for the softmax head, off with --search-time 0", description: "train rows of per-label logits directly (a full-rank linear model: dims becomes the label count, the output layer stays the identity) instead of dims-wide rows and a learned output layer; softmax and sigmoid heads (--no-linear keeps hidden rows)" },
  // The epochs and the rate below are used as they are only with --search-time 0; otherwise the
  // search picks the epochs by early stopping and the rate from 0.25 to 2 (search-settings.ts).
  epochs: { flag: "--epochs", kind: "int", min: 1, max: 1000, default: 5, defaultText: "chosen by early stopping on validation (5 with --search-time 0)", description: "passes over the training data" },
  learningRate: { flag: "--learning-rate", kind: "float", min: 1e-6, max: 10, default: 0.5, defaultText: "chosen: 0.25 to 2, starting at 0.5", description: "SGD learning rate: the base of every row's adaptive rate, or with --no-adaptive-rates the initial rate, decaying linearly to zero" },
  // On by default: with one rate for all rows, a row's step shrinks with the length of the
  // texts it occurs in (each of n features gets 1/n of the gradient), so long documents and
  // large label sets barely trained in the epochs a build can afford. On the training parts of
  // the suite corpora (grouped validation split, scripts/bench/learner-lab.ts) it lifted
  // validation accuracy from 0.21 to 0.35 (library passages), 0.69 to 0.91 (language
  // identification with character n-grams), 0.761 to 0.769 (package sections) and 0.973 to
  // 0.979 (SpamAssassin mail), in fewer epochs.
  adaptiveRates: { flag: "--adaptive-rates", kind: "boolean", default: true, description: "give every feature row its own learning rate, scaled down as its gradients add up (row-wise Adagrad); --no-adaptive-rates uses one decaying rate for all rows" },
  threads: { flag: "--threads", kind: "int", min: 1, max: 64, default: 1, description: "training threads (1 is deterministic)" },
  seed: { flag: "--seed", kind: "int", min: 0, max: 0xffffffff, default: 1, description: "seed for the split, shuffling and initialization" },
  holdout: { flag: "--holdout", kind: "float", min: 0, max: 0.9, default: 0.1, description: "fraction held out for validation (stratified; rows of one --group-field group and near-identical texts stay together)" },
  // 1 MiB by default: far below every Worker limit, and on SpamAssassin pruning 5.6 MB down to
  // 1 MiB cost nothing measurable; 0 turns the budget off.
  maxBytes: { flag: "--max-bytes", kind: "size", min: 0, default: 1024 * 1024, description: "size budget of the compiled model (512k, 2m; 0 = none)" },
  keepFeatures: { flag: "--keep-features", kind: "int", min: 0, max: 1 << 26, default: 0, description: "prune to at most N rows (0 = no limit)" },
  precision: { flag: "--precision", kind: "enum", values: ["int8", "float32"], default: "int8", description: "storage of rows and output weights" },
  fineTuneEpochs: { flag: "--fine-tune-epochs", kind: "int", min: 0, max: 100, default: 2, description: "epochs retraining the output layer on the compiled rows" },
  foldOutput: { flag: "--fold-output", kind: "boolean", default: true, description: "store each row's contribution to every label's logit (the output layer multiplied in) when there are fewer labels than dims: smaller and faster (--no-fold-output keeps the layer)" },
  // On by default: it changes nothing for text in spaced scripts, and without it a sentence of
  // Chinese or Thai is one "word" the model has almost never seen.
  unspacedScripts: { flag: "--unspaced-scripts", kind: "boolean", default: true, description: "split scripts written without spaces (Chinese, Japanese, Thai, Lao, Khmer, Myanmar) into one token per letter, so pairs of letters act as words (--no-unspaced-scripts keeps each run as one word)" },
  // On by default: folding maps evasive spellings onto the words the model learned, and the
  // model records its normalization (3 today), so it always reads text by the rules it was trained with.
  foldEvasion: { flag: "--fold-evasion", kind: "boolean", default: true, description: "fold evasive spellings before hashing: lookalike letters (UTS #39), leetspeak, spaced or dotted letters, padding and stretched letters, plus [mixed-script] and [hidden-chars] features (--no-fold-evasion reads text as normalization 1)" },
  maxTokens: { flag: "--max-tokens", kind: "int", min: 1, max: 1 << 20, default: 2000, description: "tokens read per text; the rest is ignored and reported" },
  targetPrecision: { flag: "--target-precision", kind: "map", placeholder: "L=P", default: {}, description: "label=P: threshold reaching precision P on validation (repeat or comma-separate)" },
  targetRecall: { flag: "--target-recall", kind: "map", placeholder: "L=R", default: {}, description: "label=R: threshold reaching recall R on validation" },
  actions: { flag: "--action", kind: "actions", placeholder: "L=ACTION", default: {}, description: "ACTION = block, review or route:DEST: what a label's rule does (default block for precision targets, review for recall-only targets)" },
  reviewBelow: { flag: "--review-below", kind: "float", min: 0, max: 1, default: 0, description: "send texts whose top score is below this to review (0 = off)" },
  calibrate: { flag: "--calibrate", kind: "boolean", default: true, description: "fit temperature scaling on validation (--no-calibrate to skip)" },
  fingerprint: { flag: "--fingerprint", kind: "boolean", default: true, description: "store a Bloom filter (~1 byte per training text) so eval can warn about overlap with training data (--no-fingerprint leaves it out)" },
  nearDuplicates: { flag: "--near-duplicates", kind: "enum", values: ["together", "apart"], default: "together", description: "together: texts that differ only in case, digits, punctuation or spacing stay on one side of the validation split, so validation is not scored on near-copies of training texts; apart: split them like any other rows" },
  searchTime: { flag: "--search-time", kind: "seconds", min: 0, max: 86400, default: "auto", defaultText: "auto: 15 s + 10 s per million training tokens (at most 2m), or 8 more starting-point runs if longer (at most 10m)", placeholder: "TIME", description: "time the build may spend choosing epochs, learning rate, character n-grams and weighting on the validation split: seconds (30, 30s, 2m), auto (scaled with the data) or 0 (no search: the table's defaults)" },
  maxUs: { flag: "--max-us", kind: "float", min: 0, max: 1e6, default: 0, description: "the build's search skips settings whose compiled model takes longer than this to classify a 300-token validation text (µs, measured on this machine; 0 = no limit)" },
};

/** Settings with every default filled in. */
export function defaultBuildSettings(): BuildSettings {
  const settings = {} as Record<string, unknown>;
  for (const [key, spec] of Object.entries(BUILD_SETTINGS)) settings[key] = structuredClone(spec.default);
  return settings as unknown as BuildSettings;
}

/** Thrown for a setting value that is out of range or malformed. */
export class SettingError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SettingError";
  }
}

/**
 * Parses one setting from text (a CLI value or a config string) and checks its range.
 * @example parseSetting("charSpan", "2-5") // [2, 5]
 */
export function parseSetting<K extends keyof BuildSettings>(key: K, raw: unknown, where: string): BuildSettings[K] {
  const spec = BUILD_SETTINGS[key] as SettingSpec<K>;
  const fail = (expected: string): never => {
    throw new SettingError(`${where}: expected ${expected}, got ${JSON.stringify(raw)}`);
  };
  const range = () => `${spec.min ?? "-∞"}..${spec.max ?? "∞"}`;
  switch (spec.kind) {
    case "int": {
      const value = typeof raw === "number" ? raw : Number(String(raw).trim());
      if (!Number.isInteger(value) || (spec.min !== undefined && value < spec.min) || (spec.max !== undefined && value > spec.max)) fail(`an integer in ${range()}`);
      return value as BuildSettings[K];
    }
    case "float": {
      const value = typeof raw === "number" ? raw : Number(String(raw).trim());
      if (!Number.isFinite(value) || (spec.min !== undefined && value < spec.min) || (spec.max !== undefined && value > spec.max)) fail(`a number in ${range()}`);
      return value as BuildSettings[K];
    }
    case "size": {
      const value = typeof raw === "number" ? raw : parseSize(String(raw));
      if (value === null || value < 0) fail('a size like 131072, 128k or 2m');
      return value as BuildSettings[K];
    }
    case "span": {
      if (Array.isArray(raw) && raw.length === 2 && raw.every((n) => Number.isInteger(n))) return checkSpan(raw as [number, number], spec.max ?? 8, fail) as BuildSettings[K];
      const text = String(raw).trim();
      if (text === "0") return [0, 0] as BuildSettings[K];
      const match = /^(\d+)(?:-(\d+))?$/.exec(text);
      if (!match) fail('"A-B" (e.g. 3-5), "N", or 0 for off');
      const low = Number((match as RegExpExecArray)[1]);
      const high = (match as RegExpExecArray)[2] === undefined ? low : Number((match as RegExpExecArray)[2]);
      return checkSpan([low, high], spec.max ?? 8, fail) as BuildSettings[K];
    }
    case "seconds": {
      if (raw === "auto") return "auto" as BuildSettings[K];
      const value = typeof raw === "number" ? raw : parseSeconds(String(raw));
      if (value === null || (spec.min !== undefined && value < spec.min) || (spec.max !== undefined && value > spec.max)) fail(`auto or a time like 30, 30s, 2m (0 = off), at most ${spec.max} s`);
      return value as BuildSettings[K];
    }
    case "enum": {
      if (!spec.values?.includes(String(raw))) fail(`one of ${spec.values?.join(", ")}`);
      return String(raw) as BuildSettings[K];
    }
    case "boolean": {
      if (typeof raw === "boolean") return raw as BuildSettings[K];
      if (raw === "true" || raw === "false") return (raw === "true") as BuildSettings[K];
      return fail("true or false");
    }
    case "actions": {
      const entries: Record<string, string> = {};
      const pairs = typeof raw === "object" && raw !== null && !Array.isArray(raw) ? Object.entries(raw) : String(raw).split(",").map((part) => part.split("=").map((x) => x.trim()));
      for (const [label, action] of pairs as [string, unknown][]) {
        if (!label || typeof action !== "string" || !/^(block|review|route:.+)$/.test(action)) fail('label=block, label=review or label=route:<destination>');
        entries[label] = action as string;
      }
      return entries as BuildSettings[K];
    }
    case "map": {
      const entries: Record<string, number> = {};
      if (typeof raw === "object" && raw !== null && !Array.isArray(raw)) {
        for (const [label, value] of Object.entries(raw)) entries[label] = checkFraction(value, fail);
        return entries as BuildSettings[K];
      }
      for (const part of String(raw).split(",")) {
        const match = /^\s*([^=]+?)\s*=\s*([0-9.]+)\s*$/.exec(part);
        if (!match) fail('label=number pairs, e.g. spam=0.99');
        entries[(match as RegExpExecArray)[1]] = checkFraction(Number((match as RegExpExecArray)[2]), fail);
      }
      return entries as BuildSettings[K];
    }
  }
}

function checkSpan(span: [number, number], max: number, fail: (expected: string) => never): [number, number] {
  const [low, high] = span;
  if (low === 0 && high === 0) return [0, 0];
  if (low < 1 || high < low || high > max) fail(`a span A-B with 1 ≤ A ≤ B ≤ ${max}`);
  return [low, high];
}

function checkFraction(value: unknown, fail: (expected: string) => never): number {
  if (typeof value !== "number" || !(value > 0 && value < 1)) fail("a fraction strictly between 0 and 1");
  return value as number;
}

/** "30" → 30, "30s" → 30, "2m" → 120, "1.5h" → 5400; null when malformed. */
export function parseSeconds(text: string): number | null {
  const match = /^\s*(\d+(?:\.\d+)?)\s*(s|m|h)?\s*$/i.exec(text);
  if (!match) return null;
  const unit = (match[2] ?? "s").toLowerCase();
  return Number(match[1]) * (unit === "h" ? 3600 : unit === "m" ? 60 : 1);
}

/** "128k" → 131072, "2m" → 2097152, "4096" → 4096; null when malformed. */
export function parseSize(text: string): number | null {
  const match = /^\s*(\d+(?:\.\d+)?)\s*([kmg]i?b?|b)?\s*$/i.exec(text);
  if (!match) return null;
  const unit = (match[2] ?? "b").toLowerCase()[0];
  const factor = unit === "k" ? 1024 : unit === "m" ? 1024 ** 2 : unit === "g" ? 1024 ** 3 : 1;
  return Math.round(Number(match[1]) * factor);
}

/**
 * Validates a whole settings object (from a config file), filling defaults.
 * @example resolveBuildSettings({ dims: 16 }, "sluice.config.json").dims // 16
 */
export function resolveBuildSettings(partial: Record<string, unknown>, where: string): BuildSettings {
  const settings = defaultBuildSettings() as unknown as Record<string, unknown>;
  for (const [key, value] of Object.entries(partial)) {
    if (!(key in BUILD_SETTINGS)) throw new SettingError(`${where}: unknown setting "${key}" (known: ${Object.keys(BUILD_SETTINGS).join(", ")})`);
    settings[key] = parseSetting(key as keyof BuildSettings, value, `${where}, setting "${key}"`);
  }
  return settings as unknown as BuildSettings;
}
