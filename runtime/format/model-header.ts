// The MessagePack header of a model file: what it holds and how it is checked. This is the
// one statement of the header's schema: the loader refuses any header it rejects, and the
// writer (compiler/compile/write-model.ts) runs it on every header it writes. Unknown keys
// are ignored (so a newer writer may add provenance); known keys must be valid, and every
// number must lie in the range the compiler can produce (header-limits.ts).

import { ModelFormatError } from "../errors.ts";
import type { FeaturizerSettings } from "../featurizer/featurizer.ts";
import { NORMALIZATION_VERSIONS } from "../featurizer/normalize.ts";
import type { Policy } from "../model/policy.ts";
import { isUnitInterval, isValidTemperature, isValidWeightStep, MAX_WEIGHT_STEP, MIN_WEIGHT_STEP, TEMPERATURE_MAX, TEMPERATURE_MIN } from "./header-limits.ts";
import { metadataProblem } from "./validate-metadata.ts";
import { isPlainMap, validatePolicy } from "./validate-policy.ts";

export type HeadKind = "softmax" | "sigmoid" | "tree";
export type Weighting = "mean" | "tfidf";
export type Precision = "int8" | "float32";
/**
 * What a feature row holds. "hidden": a dims-wide embedding, scored through the output layer.
 * "logits": the row's contribution to each of the outputCount logits (the output layer
 * multiplied in at compile time), so scoring a feature costs outputCount multiply-adds
 * instead of dims. The tree head always uses "hidden" (it scores only the nodes it visits).
 */
export type RowSpace = "hidden" | "logits";

/** Everything a runtime needs besides the numeric sections, plus what people need to trust it. */
export interface ModelHeader {
  labels: string[];
  head: HeadKind;
  /** Width of the trained embeddings (and of the rows when rowSpace is "hidden"). */
  dims: number;
  rowSpace: RowSpace;
  /** Kept feature rows. */
  rowCount: number;
  /** Rows of the output layer: one per label (softmax, sigmoid) or per inner tree node (tree). */
  outputCount: number;
  featurizer: FeaturizerSettings;
  weighting: Weighting;
  precision: Precision;
  /**
   * How int8 values map back to floats: value = q × scale of its row (symmetric, per row).
   * Version 2 stores each row's scale as a one-byte code (`rowScaleCodes`, see format.ts) and
   * TF-IDF weights as u16 multiples of `weightStep`; version 1 stores both as f32.
   */
  quantization: { scheme: "symmetric-per-row"; bits: 8; rowScaleCodes?: "log2-eighths"; weightStep?: number | null } | null;
  /** Kept-slot index geometry: 2^bucketBits buckets, slot low bits stored per row. */
  index: { bucketBits: number; lowBits: number };
  /** Temperature scaling: logits are divided by this before softmax/sigmoid. */
  calibration: { temperature: number };
  /** Per-label score thresholds of the sigmoid head (a label is predicted at score ≥ threshold). */
  thresholds: number[] | null;
  policy: Policy | null;
  /** Measured on the validation split at build time. */
  metrics: Record<string, unknown>;
  /** Tool version, build time, SHA-256 of the training data, example count, settings. */
  provenance: Record<string, unknown>;
}

const MAX_DIMS = 1024;
const MAX_LABELS = 1 << 20;

/**
 * Checks a decoded header of a file in format `version`; throws ModelFormatError("bad-header")
 * naming the bad field. Version 1 headers have no rowSpace: their rows are hidden-space.
 */
export function validateHeader(value: unknown, offset: number, version: number): ModelHeader {
  const fail = (field: string, expected: string): never => {
    throw new ModelFormatError("bad-header", `header field "${field}": expected ${expected}`, offset);
  };
  if (!isPlainMap(value)) return fail("(root)", "a map");
  const header = value as Record<string, unknown>;
  const labels = header.labels;
  if (!Array.isArray(labels) || labels.length < 1 || labels.length > MAX_LABELS || !labels.every((l) => typeof l === "string")) {
    fail("labels", `an array of 1 to ${MAX_LABELS} strings`);
  }
  if (new Set(labels as string[]).size !== (labels as string[]).length) fail("labels", "distinct names");
  const head = header.head;
  if (head !== "softmax" && head !== "sigmoid" && head !== "tree") fail("head", '"softmax", "sigmoid" or "tree"');
  const labelCount = (labels as string[]).length;
  if (head !== "sigmoid" && labelCount < 2) fail("labels", "at least 2 labels for a softmax or tree head");
  checkInteger(header.dims, 1, MAX_DIMS) || fail("dims", `an integer from 1 to ${MAX_DIMS}`);
  checkInteger(header.rowCount, 0, 0x7fffffff) || fail("rowCount", "a non-negative integer");
  const expectedOutputs = head === "tree" ? labelCount - 1 : labelCount;
  header.outputCount === expectedOutputs || fail("outputCount", `${expectedOutputs} for a ${String(head)} head over ${labelCount} labels`);
  const rowSpace = version === 1 ? "hidden" : header.rowSpace;
  if (version === 1 && header.rowSpace !== undefined) fail("rowSpace", "absent in a version 1 file");
  if (rowSpace !== "hidden" && rowSpace !== "logits") fail("rowSpace", '"hidden" or "logits"');
  if (rowSpace === "logits" && head === "tree") fail("rowSpace", '"hidden" for a tree head');
  const featurizer = header.featurizer;
  if (!isPlainMap(featurizer)) return fail("featurizer", "a map");
  const f = featurizer as Record<string, unknown>;
  NORMALIZATION_VERSIONS.includes(f.normalization as number) || fail("featurizer.normalization", `version ${NORMALIZATION_VERSIONS.join(" or ")} (this runtime's rules)`);
  checkInteger(f.wordSpan, 1, 6) || fail("featurizer.wordSpan", "an integer from 1 to 6");
  checkInteger(f.charMin, 0, 12) || fail("featurizer.charMin", "an integer from 0 to 12");
  checkInteger(f.charMax, 0, 12) || fail("featurizer.charMax", "an integer from 0 to 12");
  if ((f.charMin as number) > (f.charMax as number)) fail("featurizer.charMax", "at least charMin");
  checkInteger(f.hashBits, 4, 30) || fail("featurizer.hashBits", "an integer from 4 to 30");
  checkInteger(f.hashSeed, 0, 0xffffffff) || fail("featurizer.hashSeed", "an unsigned 32-bit integer");
  checkInteger(f.maxTokens, 1, 1 << 24) || fail("featurizer.maxTokens", "a positive integer");
  if (version >= 3) typeof f.unspacedScripts === "boolean" || fail("featurizer.unspacedScripts", "true or false");
  else if (f.unspacedScripts !== undefined) fail("featurizer.unspacedScripts", `absent in a version ${version} file`);
  const weighting = header.weighting;
  if (weighting !== "mean" && weighting !== "tfidf") fail("weighting", '"mean" or "tfidf"');
  const precision = header.precision;
  if (precision !== "int8" && precision !== "float32") fail("precision", '"int8" or "float32"');
  let quantization: ModelHeader["quantization"] = precision === "int8" ? { scheme: "symmetric-per-row", bits: 8 } : null;
  if (version >= 2 && precision === "int8") {
    if (!isPlainMap(header.quantization)) return fail("quantization", "a map for an int8 model");
    const q = header.quantization as Record<string, unknown>;
    q.scheme === "symmetric-per-row" || fail("quantization.scheme", '"symmetric-per-row"');
    q.bits === 8 || fail("quantization.bits", "8");
    q.rowScaleCodes === "log2-eighths" || fail("quantization.rowScaleCodes", '"log2-eighths"');
    const step = q.weightStep ?? null;
    // A u16 step × weightStep must stay a sane weight: 1e300 would overflow to Infinity, 1e-300 to 0.
    if (weighting === "tfidf" ? !isValidWeightStep(step) : step !== null) {
      fail("quantization.weightStep", weighting === "tfidf" ? `a number from ${MIN_WEIGHT_STEP} to ${MAX_WEIGHT_STEP} for TF-IDF weights` : "nil without TF-IDF weights");
    }
    quantization = { scheme: "symmetric-per-row", bits: 8, rowScaleCodes: "log2-eighths", weightStep: step as number | null };
  }
  const index = header.index;
  if (!isPlainMap(index)) return fail("index", "a map");
  const idx = index as Record<string, unknown>;
  checkInteger(idx.bucketBits, 0, 30) || fail("index.bucketBits", "an integer from 0 to 30");
  checkInteger(idx.lowBits, 0, 16) || fail("index.lowBits", "an integer from 0 to 16");
  (idx.bucketBits as number) + (idx.lowBits as number) === f.hashBits || fail("index", "bucketBits + lowBits = featurizer.hashBits");
  if ((idx.bucketBits as number) > 24) fail("index.bucketBits", "at most 24");
  const calibration = header.calibration;
  if (!isPlainMap(calibration)) return fail("calibration", "a map");
  const temperature = (calibration as Record<string, unknown>).temperature;
  // 5e-324 would turn every logit into Infinity and every score into NaN.
  if (!isValidTemperature(temperature)) fail("calibration.temperature", `a number from ${TEMPERATURE_MIN} to ${TEMPERATURE_MAX}`);
  const thresholds = header.thresholds ?? null;
  if (thresholds !== null) {
    if (!Array.isArray(thresholds) || thresholds.length !== labelCount || !thresholds.every(isUnitInterval)) {
      fail("thresholds", `null or ${labelCount} numbers in [0, 1]`);
    }
  }
  const policy = validatePolicy(header.policy, labels as string[], fail);
  for (const field of ["metrics", "provenance"] as const) {
    if (header[field] === undefined) continue;
    if (!isPlainMap(header[field])) fail(field, "a map");
    const problem = metadataProblem(header[field], field);
    if (problem !== null) fail(field, `JSON-like data (${problem})`);
  }
  return {
    labels: labels as string[],
    head: head as HeadKind,
    dims: header.dims as number,
    rowSpace: rowSpace as RowSpace,
    rowCount: header.rowCount as number,
    outputCount: header.outputCount as number,
    featurizer: {
      normalization: f.normalization as number,
      wordSpan: f.wordSpan as number,
      charMin: f.charMin as number,
      charMax: f.charMax as number,
      hashBits: f.hashBits as number,
      hashSeed: f.hashSeed as number,
      maxTokens: f.maxTokens as number,
      ...(version >= 3 ? { unspacedScripts: f.unspacedScripts as boolean } : {}),
    },
    weighting: weighting as Weighting,
    precision: precision as Precision,
    quantization,
    index: { bucketBits: idx.bucketBits as number, lowBits: idx.lowBits as number },
    calibration: { temperature: temperature as number },
    thresholds: thresholds as number[] | null,
    policy: policy as Policy | null,
    metrics: (header.metrics ?? {}) as Record<string, unknown>,
    provenance: (header.provenance ?? {}) as Record<string, unknown>,
  };
}


function checkInteger(value: unknown, min: number, max: number): boolean {
  return typeof value === "number" && Number.isInteger(value) && value >= min && value <= max;
}
