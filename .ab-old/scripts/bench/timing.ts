// Small timing helpers for the benchmarks: per-call percentiles and batch means, measured
// with performance.now after a warm-up. Benchmarks print numbers; tests never assert them.

export interface Timing {
  p50: number;
  p99: number;
  mean: number;
  calls: number;
}

/** Microseconds per call of `run`, from `calls` individually timed calls after `warmup` calls. */
export function timePerCall(run: (i: number) => void, calls = 20000, warmup = 2000): Timing {
  for (let i = 0; i < warmup; i++) run(i);
  const samples = new Float64Array(calls);
  const started = performance.now();
  for (let i = 0; i < calls; i++) {
    const t0 = performance.now();
    run(i);
    samples[i] = (performance.now() - t0) * 1000;
  }
  const total = (performance.now() - started) * 1000;
  samples.sort();
  return { p50: samples[Math.floor(calls * 0.5)], p99: samples[Math.floor(calls * 0.99)], mean: total / calls, calls };
}

/** Mean microseconds per call over a tight loop (no per-call timer overhead). */
export function timeBatch(run: (i: number) => void, calls = 20000, warmup = 2000): number {
  for (let i = 0; i < warmup; i++) run(i);
  const started = performance.now();
  for (let i = 0; i < calls; i++) run(i);
  return ((performance.now() - started) * 1000) / calls;
}

/** Median of a few runs of `measure`. */
export function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

/**
 * Mean microseconds per call in the quickest of `windows` runs of `calls` calls each. On a
 * shared VM the same code runs up to 1.7× slower for seconds at a time (measured: windows of
 * 2000 classify calls between 24 and 43 µs in one process, no GC or deoptimization in
 * between), so this shows the code's speed when the machine lets it run; p50 shows the run's.
 */
export function quickestWindow(run: (i: number) => void, windows = 20, calls = 2000, warmup = 2000): number {
  for (let i = 0; i < warmup; i++) run(i);
  let best = Infinity;
  for (let w = 0; w < windows; w++) {
    const started = performance.now();
    for (let i = 0; i < calls; i++) run(i);
    best = Math.min(best, ((performance.now() - started) * 1000) / calls);
  }
  return best;
}

/**
 * Collects the garbage a build left before timing starts (when node runs with --expose-gc, as
 * `npm run bench` does): otherwise V8's concurrent marking of that garbage shares the 2 cores
 * with the timed loop and slows it by up to 1.7× for a second or more (measured).
 */
export function settleHeap(): void {
  const gc = (globalThis as { gc?: () => void }).gc;
  if (gc) {
    gc();
    gc();
  }
}
