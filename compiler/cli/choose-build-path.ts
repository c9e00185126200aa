// In memory or on disk? An in-memory build holds every example's text, its feature lists and
// the training arrays at once, so its memory grows with examples × tokens, not with the
// file's bytes alone (short texts cost more per byte than long ones: each example carries
// fixed overhead). The projection reads the first few MiB of the file, counts examples and
// words there, scales them to the whole file and prices them with the per-example and
// per-feature costs measured on this build (scripts/bench/default-build-memory.ts, forced in
// memory with --max-memory 64g, 2026-12-04: CSVs of short texts of 10, 25 and 100 MB peaked at
// 334, 457 and 1,268 MB of RSS and project 334, 490 and 1,268 MB). The build goes on disk when
// the projection exceeds the memory budget: --max-memory, or by default 2 × the file's size +
// 300 MB, which in-memory builds of these texts meet up to about 8 MB.

import { closeSync, openSync, readSync, statSync } from "node:fs";
import type { BuildSettings } from "../build/build-settings.ts";

const SAMPLE_BYTES = 4 * 1024 * 1024;
const MEGABYTE = 1024 * 1024;
/**
 * What does not grow with the examples: Node, tsx and the compiler's modules (100 to 120 MB of
 * RSS before any data), the setting search's drafts over a vocabulary that nears its 2^hashBits
 * slots early, and the garbage they leave between collections. Fitted to the three builds above:
 * the per-example and per-feature costs below matched the growth from 25 to 100 MB (1.04×), the
 * fixed part was 70 MB more than the 160 MB it used to be.
 */
export const BASE_BYTES = 230 * MEGABYTE;
/** The default budget: peak RSS at most 2 × the input plus this. */
export const BUDGET_MARGIN_BYTES = 300 * MEGABYTE;
/** Per example held in memory: the text's string header, the example and label objects, CSR offsets, shuffled order. */
const BYTES_PER_EXAMPLE = 700;
/** Per feature of every example: u32 slot in the CSR lists plus growth slack and the featurizer's scratch copies. */
const BYTES_PER_FEATURE = 12;
/** Per byte of text: the string itself (one byte per character for Latin-1 text, two otherwise), and the fingerprint collector's copy. */
const BYTES_PER_TEXT_BYTE = 3;

export interface BuildPathChoice {
  onDisk: boolean;
  /** Projected peak RSS of an in-memory build, bytes. */
  projectedBytes: number;
  budgetBytes: number;
  /** One line for the build's messages. */
  reason: string;
}

/**
 * Projects an in-memory build's peak memory from a sample of the file and picks the path.
 * @example chooseBuildPath("data.csv", settings, { forceOnDisk: false }).onDisk
 */
export function chooseBuildPath(path: string, settings: BuildSettings, options: { forceOnDisk: boolean; maxMemoryBytes?: number }): BuildPathChoice {
  const size = statSync(path).size;
  const budgetBytes = options.maxMemoryBytes ?? 2 * size + BUDGET_MARGIN_BYTES;
  const projectedBytes = projectInMemoryBytes(path, size, settings);
  const mb = (bytes: number) => `${Math.round(bytes / MEGABYTE)} MB`;
  const budgetName = options.maxMemoryBytes === undefined ? `the default budget of 2 × the file + 300 MB = ${mb(budgetBytes)}` : `--max-memory ${mb(budgetBytes)}`;
  if (options.forceOnDisk) return { onDisk: true, projectedBytes, budgetBytes, reason: "on disk: --on-disk" };
  if (projectedBytes > budgetBytes) return { onDisk: true, projectedBytes, budgetBytes, reason: `on disk: an in-memory build would need about ${mb(projectedBytes)}, over ${budgetName}` };
  return { onDisk: false, projectedBytes, budgetBytes, reason: `in memory: about ${mb(projectedBytes)}, within ${budgetName}` };
}

/** BASE + examples × per-example cost + features × per-feature cost + text bytes, scaled from a sample. */
export function projectInMemoryBytes(path: string, size: number, settings: BuildSettings): number {
  const sample = readSample(path);
  if (sample.length === 0) return BASE_BYTES;
  let lines = 0;
  let words = 0;
  let wordChars = 0;
  let inWord = false;
  for (let i = 0; i < sample.length; i++) {
    const byte = sample[i];
    if (byte === 0x0a) lines++;
    const space = byte === 0x20 || byte === 0x0a || byte === 0x09 || byte === 0x0d || byte === 0x2c || byte === 0x22;
    if (!space && (byte & 0xc0) !== 0x80) wordChars++;
    if (space) inWord = false;
    else if (!inWord) {
      inWord = true;
      words++;
    }
  }
  const scale = size / sample.length;
  const examples = Math.max(1, lines) * scale;
  const tokens = words * scale;
  const averageWord = words > 0 ? wordChars / words : 0;
  const [charMin, charMax] = settings.charSpan;
  let charGramsPerWord = 0;
  // A word of length L framed by edge marks has L + 2 − n + 1 character n-grams of length n.
  if (charMin > 0) for (let n = charMin; n <= charMax; n++) charGramsPerWord += Math.max(0, averageWord + 3 - n);
  const featuresPerToken = settings.wordSpan + charGramsPerWord;
  return BASE_BYTES + examples * BYTES_PER_EXAMPLE + tokens * featuresPerToken * BYTES_PER_FEATURE + size * BYTES_PER_TEXT_BYTE;
}

function readSample(path: string): Uint8Array {
  const fd = openSync(path, "r");
  try {
    const buffer = new Uint8Array(SAMPLE_BYTES);
    let filled = 0;
    while (filled < SAMPLE_BYTES) {
      const read = readSync(fd, buffer, filled, SAMPLE_BYTES - filled, filled);
      if (read === 0) break;
      filled += read;
    }
    return buffer.subarray(0, filled);
  } finally {
    closeSync(fd);
  }
}
