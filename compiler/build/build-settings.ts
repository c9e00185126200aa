// Every build setting in one typed table: the CLI flags, the `sluice.config.json` keys and
// the programmatic defaults all come from here, and a setting without a description does
// not type-check.

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
  epochs: number;
  learningRate: number;
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
}

type Kind = "int" | "float" | "span" | "size" | "enum" | "map" | "actions" | "boolean";

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
  dims: { flag: "--dims", kind: "int", min: 1, max: 512, default: 24, description: "width of the feature embeddings" },
  wordSpan: { flag: "--word-span", kind: "int", min: 1, max: 4, default: 2, description: "longest word n-gram (1 = words only, 2 = words + pairs)" },
  // Off by default: on the demo topics, the contact form and SpamAssassin, 3-4 character
  // n-grams added at most 0.2 accuracy points for 3-4x the training and classify time
  // (README, "Measured numbers"); typo-heavy data may still want them, and tune tries them.
  charSpan: { flag: "--char-span", kind: "span", min: 0, max: 8, default: [0, 0], description: "character n-gram lengths inside words, A-B (0 = off)" },
  hashBits: { flag: "--hash-bits", kind: "int", min: 10, max: 26, default: 20, description: "size of the hashed feature space, 2^N slots" },
  hashSeed: { flag: "--hash-seed", kind: "int", min: 0, max: 0xffffffff, default: 0, description: "seed of the feature hash" },
  minDocs: { flag: "--min-docs", kind: "int", min: 1, max: 1_000_000, default: 2, description: "ignore features seen in fewer than N training examples" },
  // TF-IDF and 5 epochs by default: in 5-fold cross-validation on the training parts of the
  // demo topics, the contact form and SpamAssassin they beat mean weighting and 10 epochs on
  // all three (0.9671 vs 0.9619, 0.9684 vs 0.9670, 0.9840 vs 0.9811 accuracy) in half the
  // training time; 10 epochs with TF-IDF scored 0.9630, 0.9674, 0.9852 (README, "Defaults").
  weighting: { flag: "--weighting", kind: "enum", values: ["mean", "tfidf"], default: "tfidf", description: "how feature rows are combined: tfidf weighs each row by its inverse document frequency" },
  head: { flag: "--head", kind: "enum", values: ["auto", "softmax", "sigmoid", "tree"], default: "auto", description: "output layer (auto: sigmoid for several labels per example, tree for large label sets, else softmax)" },
  epochs: { flag: "--epochs", kind: "int", min: 1, max: 1000, default: 5, description: "passes over the training data" },
  learningRate: { flag: "--learning-rate", kind: "float", min: 1e-6, max: 10, default: 0.5, description: "initial SGD learning rate (decays linearly to zero)" },
  threads: { flag: "--threads", kind: "int", min: 1, max: 64, default: 1, description: "training threads (1 is deterministic)" },
  seed: { flag: "--seed", kind: "int", min: 0, max: 0xffffffff, default: 1, description: "seed for the split, shuffling and initialization" },
  holdout: { flag: "--holdout", kind: "float", min: 0, max: 0.9, default: 0.1, description: "fraction held out for validation (stratified)" },
  // 1 MiB by default: far below every Worker limit, and on SpamAssassin pruning 5.6 MB down to
  // 1 MiB cost nothing measurable; 0 turns the budget off.
  maxBytes: { flag: "--max-bytes", kind: "size", min: 0, default: 1024 * 1024, description: "size budget of the compiled model (512k, 2m; 0 = none)" },
  keepFeatures: { flag: "--keep-features", kind: "int", min: 0, max: 1 << 26, default: 0, description: "prune to at most N rows (0 = no limit)" },
  precision: { flag: "--precision", kind: "enum", values: ["int8", "float32"], default: "int8", description: "storage of rows and output weights" },
  fineTuneEpochs: { flag: "--fine-tune-epochs", kind: "int", min: 0, max: 100, default: 2, description: "epochs retraining the output layer on the compiled rows" },
  foldOutput: { flag: "--fold-output", kind: "boolean", default: true, description: "store each row's contribution to every label's logit (the output layer multiplied in) when there are fewer labels than dims: smaller and faster (--no-fold-output keeps the layer)" },
  maxTokens: { flag: "--max-tokens", kind: "int", min: 1, max: 1 << 20, default: 2000, description: "tokens read per text; the rest is ignored and reported" },
  targetPrecision: { flag: "--target-precision", kind: "map", placeholder: "L=P", default: {}, description: "label=P: threshold reaching precision P on validation (repeat or comma-separate)" },
  targetRecall: { flag: "--target-recall", kind: "map", placeholder: "L=R", default: {}, description: "label=R: threshold reaching recall R on validation" },
  actions: { flag: "--action", kind: "actions", placeholder: "L=ACTION", default: {}, description: "ACTION = block, review or route:DEST: what a label's rule does (default block for precision targets, review for recall-only targets)" },
  reviewBelow: { flag: "--review-below", kind: "float", min: 0, max: 1, default: 0, description: "send texts whose top score is below this to review (0 = off)" },
  calibrate: { flag: "--calibrate", kind: "boolean", default: true, description: "fit temperature scaling on validation (--no-calibrate to skip)" },
  fingerprint: { flag: "--fingerprint", kind: "boolean", default: true, description: "store a Bloom filter (~1 byte per training text) so eval can warn about overlap with training data (--no-fingerprint leaves it out)" },
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
