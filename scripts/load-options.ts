// What the load scripts share: integer options from the command line and the percentile.

/**
 * `--name N` from process.argv, an integer in [1, max], or `fallback` when absent.
 * @example integerFlag("--requests", 20_000, 200_000)
 */
export function integerFlag(name: string, fallback: number, max: number): number {
  const index = process.argv.indexOf(name);
  if (index < 0) return fallback;
  const value = Number(process.argv[index + 1]);
  if (!Number.isInteger(value) || value < 1 || value > max) throw new Error(`${name}: expected an integer from 1 to ${max}`);
  return value;
}

/**
 * The nearest-rank percentile of sorted values (common practice, no source).
 * @example percentile(Float64Array.from([1, 2, 3, 4]), 50) // 2
 */
export function percentile(sorted: Float64Array, p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}
