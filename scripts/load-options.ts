// What the load scripts share: integer options from the command line, and the Miniflare
// settings that serve the built Worker bundle on a loopback port.

import { Log, LogLevel, type MiniflareOptions } from "miniflare";

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
 * Miniflare options serving a built Worker bundle on 127.0.0.1 (a free port), as the load
 * scripts run it; `extra` adds bindings or databases.
 * @example new Miniflare(loopbackWorkerOptions(bundle, { bindings: { CANDIDATE: "off" } }))
 */
export function loopbackWorkerOptions(bundle: { entry: string; outdir: string }, extra: Partial<MiniflareOptions> = {}): MiniflareOptions {
  return {
    modules: true,
    scriptPath: bundle.entry,
    modulesRoot: bundle.outdir,
    modulesRules: [{ type: "Data", include: ["**/*.sluice"] }],
    compatibilityDate: "2026-04-26",
    cf: false,
    host: "127.0.0.1",
    port: 0,
    log: new Log(LogLevel.WARN),
    ...extra,
  };
}
