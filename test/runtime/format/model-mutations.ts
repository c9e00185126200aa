// Seeded mutations of model files, for the mutation fuzz test and `npm run fuzz`: bit flips,
// byte edits, truncations, splices, section directory edits, stray bytes and header-field
// edits, most with a recomputed CRC-32 so they reach the checks behind the checksum. And the
// one property every mutated file must have (checkMutatedModel): it is refused with a coded
// ModelFormatError, or it loads, scores finite numbers, decides and explains without throwing.

import { pack, unpack } from "msgpackr";
import { createRandom, type RandomSource } from "../../../compiler/train/random.ts";
import { crc32, loadModel, MODEL_FORMAT_ERROR_CODES, ModelFormatError } from "../../../runtime/index.ts";

/** Recomputes the trailer so a change reaches the checks behind the checksum. */
export function withChecksum(bytes: Uint8Array): Uint8Array {
  const copy = bytes.slice();
  new DataView(copy.buffer).setUint32(copy.length - 4, crc32(copy, 0, copy.length - 4), true);
  return copy;
}

function directoryStart(bytes: Uint8Array): number {
  return (16 + new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(12, true) + 7) & ~7;
}

/** The decoded header of a (valid) model file. */
export function headerOf(bytes: Uint8Array): Record<string, any> {
  const length = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(12, true);
  return unpack(bytes.subarray(16, 16 + length)) as Record<string, any>;
}

/** The file with its header replaced by `header` (sections move by a multiple of 8), checksum fixed. */
export function withHeader(file: Uint8Array, header: unknown): Uint8Array {
  const oldDirectory = directoryStart(file);
  const packed = pack(header) as Uint8Array;
  const newDirectory = (16 + packed.length + 7) & ~7;
  const shift = newDirectory - oldDirectory; // both are multiples of 8
  const body = file.subarray(oldDirectory, file.length - 4);
  const out = new Uint8Array(newDirectory + body.length + 4);
  out.set(file.subarray(0, 12));
  const view = new DataView(out.buffer);
  view.setUint32(12, packed.length, true);
  out.set(packed, 16);
  out.set(body, newDirectory);
  const count = view.getUint32(newDirectory, true);
  for (let i = 0; i < count && newDirectory + 8 + 16 * i + 16 <= out.length - 4; i++) {
    const at = newDirectory + 8 + 16 * i;
    view.setUint32(at + 8, (view.getUint32(at + 8, true) + shift) >>> 0, true);
  }
  return withChecksum(out);
}

/** Values a careless or hostile writer might leave in a header field. */
const HOSTILE_VALUES: (() => unknown)[] = [
  () => NaN, () => Infinity, () => -Infinity, () => 5e-324, () => 1e300, () => -1e300, () => -1, () => 0, () => 1, () => 1.5, () => 2 ** 53,
  () => 2n ** 64n - 1n, () => "x", () => "", () => ({}), () => [], () => null, () => true, () => "y".repeat(5000), () => [[[[[]]]]], () => [NaN],
  () => ({ rules: 5 }), () => ({ rules: [{ label: 7, action: "block", threshold: 0.5 }] }), () => new Uint8Array(3),
];

/** All paths to leaves and maps of a decoded header. */
function pathsOf(value: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (prefix.length > 0) out.push(prefix);
  if (value !== null && typeof value === "object" && !(value instanceof Uint8Array) && prefix.length < 6) {
    for (const key of Object.keys(value as object)) pathsOf((value as Record<string, unknown>)[key], [...prefix, Array.isArray(value) ? Number(key) : key], out);
  }
  return out;
}

function pick<T>(random: RandomSource, items: readonly T[]): T {
  return items[Math.floor(random.next() * items.length)];
}

function position(random: RandomSource, from: number, to: number): number {
  return from + Math.floor(random.next() * Math.max(1, to - from));
}

export type MutationKind = "bit-flips" | "byte-edit" | "truncation" | "splice" | "directory-edit" | "stray-bytes" | "header-field" | "header-policy" | "raw-flip";

/** The mutations, each given the original file; every one but raw-flip fixes the checksum. */
const MUTATIONS: Record<MutationKind, (file: Uint8Array, random: RandomSource) => Uint8Array> = {
  "bit-flips": (file, random) => {
    const bytes = file.slice();
    const flips = 1 + Math.floor(random.next() * 4);
    for (let i = 0; i < flips; i++) bytes[position(random, 8, file.length - 4)] ^= 1 << Math.floor(random.next() * 8);
    return withChecksum(bytes);
  },
  "byte-edit": (file, random) => {
    const bytes = file.slice();
    bytes[position(random, 8, file.length - 4)] = pick(random, [0, 0xff, 0x7f, 0x80, Math.floor(random.next() * 256)]);
    return withChecksum(bytes);
  },
  truncation: (file, random) => {
    const length = position(random, 4, file.length - 1);
    return withChecksum(file.slice(0, length));
  },
  splice: (file, random) => {
    const bytes = file.slice();
    const length = 1 + Math.floor(random.next() * 64);
    const from = position(random, 8, file.length - 4 - length);
    const to = position(random, 8, file.length - 4 - length);
    bytes.copyWithin(to, from, from + length);
    return withChecksum(bytes);
  },
  "directory-edit": (file, random) => {
    const bytes = file.slice();
    const view = new DataView(bytes.buffer);
    const start = directoryStart(bytes);
    const count = view.getUint32(start, true);
    const at = start + 8 + 16 * Math.floor(random.next() * Math.max(1, count)) + 4 * Math.floor(random.next() * 4);
    if (at + 4 > bytes.length - 4) return withChecksum(bytes);
    const old = view.getUint32(at, true);
    view.setUint32(at, pick(random, [old + 8, old - 8, old + 1, old * 2, 0, 0xffffffff, Math.floor(random.next() * 2 ** 32)]) >>> 0, true);
    return withChecksum(bytes);
  },
  "stray-bytes": (file, random) => {
    const extra = 1 + Math.floor(random.next() * 16);
    const bytes = new Uint8Array(file.length + extra);
    bytes.set(file.subarray(0, file.length - 4));
    for (let i = 0; i < extra; i++) bytes[file.length - 4 + i] = Math.floor(random.next() * 256);
    return withChecksum(bytes);
  },
  "header-field": (file, random) => {
    const header = headerOf(file);
    const path = pick(random, pathsOf(header));
    let target: any = header;
    for (const key of path.slice(0, -1)) target = target[key];
    const last = path[path.length - 1];
    if (random.next() < 0.1) delete target[last];
    else target[last] = pick(random, HOSTILE_VALUES)();
    return withHeader(file, header);
  },
  "header-policy": (file, random) => {
    const header = headerOf(file);
    const labels: string[] = Array.isArray(header.labels) ? header.labels : ["x"];
    const rule: Record<string, unknown> = { label: pick(random, labels), action: pick(random, ["block", "review", "route"]), threshold: random.next(), routeTo: "team@example.test" };
    const field = pick(random, ["label", "action", "threshold", "reviewFrom", "routeTo", "target"]);
    rule[field] = pick(random, HOSTILE_VALUES)();
    header.policy = random.next() < 0.2 ? { rules: [rule], uncertainBelow: pick(random, HOSTILE_VALUES)() } : { rules: [rule] };
    return withHeader(file, header);
  },
  "raw-flip": (file, random) => {
    const bytes = file.slice();
    bytes[position(random, 0, file.length)] ^= 1 + Math.floor(random.next() * 255);
    return bytes;
  },
};

export const MUTATION_KINDS = Object.keys(MUTATIONS) as MutationKind[];

/**
 * `count` mutations of `file`, the same for the same seed.
 * @example for (const { kind, bytes } of mutationsOf(file, 5000, 17)) checkMutatedModel(bytes)
 */
export function* mutationsOf(file: Uint8Array, count: number, seed: number): Generator<{ kind: MutationKind; bytes: Uint8Array }> {
  const random = createRandom(seed);
  for (let i = 0; i < count; i++) {
    const kind = MUTATION_KINDS[i % MUTATION_KINDS.length];
    yield { kind, bytes: MUTATIONS[kind](file, random) };
  }
}

/** Texts every loaded mutant must score, decide and explain. */
export const PROBE_TEXTS = [
  "",
  "hello",
  "WIN A FREE PRIZE!!! click http://prize.example/now",
  "Refund please: I was charged twice for order 12345",
  "Grüße aus Köln — привет 你好 🙂 e\u0301\u200d",
];

export type MutantOutcome = "refused" | "loaded";

/**
 * Loads a mutated file and checks the fail-closed property; throws an Error describing the
 * violation (an untyped error, an uncoded refusal, a non-finite score, a throwing decide).
 */
export function checkMutatedModel(bytes: Uint8Array): MutantOutcome {
  let model;
  try {
    model = loadModel(bytes);
  } catch (error) {
    if (!(error instanceof ModelFormatError)) throw new Error(`load threw ${(error as Error)?.name}: ${(error as Error)?.message}`);
    if (!(error.code in MODEL_FORMAT_ERROR_CODES)) throw new Error(`refused with an unknown code ${String(error.code)}`);
    return "refused";
  }
  JSON.stringify(model.meta);
  for (const text of PROBE_TEXTS) {
    const scores = model.score(text).scores;
    for (let k = 0; k < scores.length; k++) if (!(scores[k] >= 0 && scores[k] <= 1)) throw new Error(`score ${k} of ${JSON.stringify(text.slice(0, 20))} is ${scores[k]}`);
    for (const item of model.classify(text, { top: model.labels.length })) if (!Number.isFinite(item.score)) throw new Error(`classify gave ${item.score}`);
    const decision = model.decide(text);
    if (!["allow", "review", "block", "route"].includes(decision.action)) throw new Error(`decide gave action ${String(decision.action)}`);
    if (decision.fault !== undefined) throw new Error(`a loaded model failed closed: ${decision.fault.code} ${decision.fault.message}`);
    JSON.stringify(decision);
    if (text.length < 20) continue; // explanations are the slow part: two texts are enough
    for (const label of model.explain(text, { top: 2 }).labels) {
      if (!Number.isFinite(label.logit) || label.features.some((f) => !Number.isFinite(f.contribution))) throw new Error(`explain gave a non-finite value for ${label.label}`);
    }
  }
  return "loaded";
}
