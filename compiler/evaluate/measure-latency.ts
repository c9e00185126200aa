// How long one `classify` call takes, in CPU time of this process: the build reports it for a
// 20-token and a 300-token text cut from the validation data, and setting searches (the
// build's own and `tune`) compare candidates by it. Timing is a measurement, never a test
// assertion: the number depends on the machine and on what else it is doing.

import type { Model } from "../../runtime/model/model.ts";
import { createFeatureBuffer } from "../../runtime/featurizer/featurizer.ts";

/** Token counts of the two texts every build times (the short message and the long mail). */
export const LATENCY_TOKENS = [20, 300] as const;

export interface TextLatency {
  /** Tokens the featurizer read from the text. */
  tokens: number;
  characters: number;
  /** Median over timing windows of the mean CPU µs per classify call, the same text repeated. */
  microseconds: number;
}

/** The build's `latency` report: one entry per text length. */
export interface LatencyReport {
  tokens20: TextLatency;
  tokens300: TextLatency;
}

export interface LatencyOptions {
  /** Length of one timing window in ms (default 2). */
  windowMs?: number;
  /** Number of windows; the median window is reported (default 5). */
  windows?: number;
}

/**
 * Mean CPU µs per `model.classify(text)` call: a warm-up window, then `windows` windows of about
 * `windowMs` each, reporting the median window (one slow window — a GC, another process —
 * does not move it). About (windows + 1) × windowMs of wall time.
 * @example measureClassifyMicroseconds(model, "where is my parcel?") // 2.1
 */
export function measureClassifyMicroseconds(model: Model, text: string, options: LatencyOptions = {}): number {
  const windowMs = options.windowMs ?? 2;
  const windows = options.windows ?? 5;
  timeWindow(model, text, windowMs);
  const means: number[] = [];
  for (let w = 0; w < windows; w++) means.push(timeWindow(model, text, windowMs));
  means.sort((a, b) => a - b);
  return means[means.length >> 1];
}

/**
 * Mean CPU µs per call over one window of about `windowMs` of wall time. CPU time of this
 * process, not wall time: a Worker is billed for CPU time, and on a shared machine wall time
 * also counts the time other processes held the core (measured: ten times the CPU time at a
 * load average of 15 on 2 cores). The CPU clock is read only at the window's ends (a read
 * costs a few µs); the cheap wall clock decides when the window is over.
 */
function timeWindow(model: Model, text: string, windowMs: number): number {
  let calls = 0;
  const cpuStarted = cpuMicroseconds();
  const started = performance.now();
  do {
    // Batches of 8 keep the clock reads out of the measured time.
    for (let i = 0; i < 8; i++) model.classify(text);
    calls += 8;
  } while (performance.now() - started < windowMs);
  return (cpuMicroseconds() - cpuStarted) / calls;
}

/** User + system CPU µs this process has used (all its threads). */
export function cpuMicroseconds(): number {
  const usage = process.cpuUsage();
  return usage.user + usage.system;
}

/**
 * A text of exactly `tokens` tokens (as the model's featurizer counts them) cut from the
 * start of `pool` joined by spaces, cycling through the pool when it is shorter.
 * @example textOfTokens(model, validationTexts, 20)
 */
export function textOfTokens(model: Model, pool: readonly string[], tokens: number): string {
  const chunks: string[] = [];
  const source = pool.filter((text) => text.trim().length > 0);
  if (source.length === 0) return "";
  const buffer = createFeatureBuffer();
  const count = (chunkCount: number) => {
    model.featurizer.featurize(chunks.slice(0, chunkCount).join(" "), buffer);
    return buffer.tokenCount;
  };
  // Gather whitespace chunks, cycling through the pool, until they hold at least `tokens` tokens.
  for (let i = 0; chunks.length < 4 * tokens + 64; i++) {
    for (const chunk of source[i % source.length].split(/\s+/)) if (chunk.length > 0) chunks.push(chunk);
    if (count(chunks.length) >= tokens) break;
  }
  // The fewest chunks that reach `tokens` tokens (a chunk may hold several), by bisection.
  let low = 0;
  let high = chunks.length;
  while (low < high) {
    const middle = (low + high) >>> 1;
    if (count(middle) >= tokens) high = middle;
    else low = middle + 1;
  }
  return chunks.slice(0, low).join(" ");
}

/**
 * The build's latency report: µs per classify call for a 20-token and a 300-token text cut
 * from `pool` (the validation texts, or the training texts when there is no validation).
 * @example measureLatency(model, validation.map((e) => e.text)).tokens300.microseconds
 */
export function measureLatency(model: Model, pool: readonly string[], options: LatencyOptions = {}): LatencyReport {
  const [short, long] = LATENCY_TOKENS.map((tokens) => {
    const text = textOfTokens(model, pool, tokens);
    const microseconds = measureClassifyMicroseconds(model, text, options);
    return { tokens: model.score(text).tokenCount, characters: text.length, microseconds: Math.round(microseconds * 1000) / 1000 };
  });
  return { tokens20: short, tokens300: long };
}
