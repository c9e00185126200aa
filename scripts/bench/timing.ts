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
