// How the comparison times one classify call of any JS system (Sluice in this process,
// natural in a child process): the same warm-up, loop and nearest-rank percentiles for all.
// Its own file so that natural-runner.ts and natural-child.ts need not import comparison.ts.

/** How single-text calls are timed. */
export interface TimingOptions {
  /** Untimed calls first, so the JIT has compiled the hot path: this many, or until warmupMs. */
  warmupCalls: number;
  warmupMs: number;
  /** Timed calls: every text once, then round again until this many (or budgetMs is spent). */
  minCalls: number;
  budgetMs: number;
}

/** Per-call latency, microseconds; percentiles by nearest rank over the sorted timings. */
export interface CallTimings {
  calls: number;
  p50: number;
  p99: number;
  mean: number;
  /** True when budgetMs ran out before minCalls. */
  stoppedEarly: boolean;
}

/**
 * Times `call` once per text with performance.now (after a warm-up), going round the texts
 * until `minCalls`; returns the timings and the results of the first pass (one per text).
 * @example const { timings, firstPass } = timeSingleCalls((t) => model.classify(t)[0].label, texts, TIMING);
 */
export function timeSingleCalls<T>(call: (text: string) => T, texts: readonly string[], options: TimingOptions): { timings: CallTimings; firstPass: T[] } {
  if (texts.length === 0) throw new Error("timeSingleCalls: no texts to time");
  const warmupStarted = performance.now();
  for (let i = 0; i < options.warmupCalls && performance.now() - warmupStarted < options.warmupMs; i++) call(texts[i % texts.length]);
  const firstPass: T[] = [];
  const micros: number[] = [];
  const started = performance.now();
  let stoppedEarly = false;
  for (let i = 0; ; i++) {
    if (i >= texts.length) {
      if (i >= options.minCalls) break;
      if (performance.now() - started > options.budgetMs) {
        stoppedEarly = true;
        break;
      }
    }
    const text = texts[i % texts.length];
    const before = performance.now();
    const result = call(text);
    micros.push((performance.now() - before) * 1000);
    if (i < texts.length) firstPass.push(result);
  }
  micros.sort((a, b) => a - b);
  const mean = micros.reduce((sum, x) => sum + x, 0) / micros.length;
  return { timings: { calls: micros.length, p50: nearestRank(micros, 0.5), p99: nearestRank(micros, 0.99), mean, stoppedEarly }, firstPass };
}

/**
 * Nearest-rank percentile of ascending values (the same rule as sklearn_reference.py; common practice, no source).
 * @example nearestRank(Float64Array.from([1, 2, 3, 4]), 0.5) // 2
 */
export function nearestRank(sorted: ArrayLike<number>, fraction: number): number {
  return sorted[Math.min(sorted.length, Math.max(1, Math.ceil(fraction * sorted.length))) - 1];
}

/**
 * Median wall time of `repeats` calls in milliseconds, stopping early once `budgetMs` is spent.
 * @example medianMilliseconds(() => loadModel(bytes), 50, 10_000).median
 */
export function medianMilliseconds(run: () => unknown, repeats: number, budgetMs: number): { median: number; repeats: number } {
  const times: number[] = [];
  const started = performance.now();
  while (times.length < repeats && (times.length === 0 || performance.now() - started < budgetMs)) {
    const before = performance.now();
    run();
    times.push(performance.now() - before);
  }
  times.sort((a, b) => a - b);
  const middle = times.length >> 1;
  return { median: times.length % 2 === 1 ? times[middle] : (times[middle - 1] + times[middle]) / 2, repeats: times.length };
}
