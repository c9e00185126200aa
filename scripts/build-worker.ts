// `npm run build:worker`: builds the two demo models (moderation and routing) when missing or
// stale (scripts/demo-model.ts), bundles the Worker offline with
// `wrangler deploy --dry-run`, then prints the bundle size raw and gzip-compressed and fails
// when the gzip size is over the 1 MiB ceiling (Workers allow far more; we keep the Worker
// small so cold starts stay short). Options: --outdir DIR (default dist), --quiet.

import { spawnSync } from "node:child_process";
import { readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";
import { ensureDemoModel } from "./demo-model.ts";

const ROOT = join(dirname(fileURLToPath(import.meta.url)), "..");

/** The gzip ceiling of the Worker bundle. */
export const WORKER_GZIP_CEILING = 1024 * 1024;

export interface WorkerBundle {
  outdir: string;
  /** The entry module (what Miniflare's scriptPath takes). */
  entry: string;
  /** Uploaded modules (source maps and the README wrangler writes are left out). */
  modules: string[];
  rawBytes: number;
  gzipBytes: number;
  /** Wrangler's own "Total Upload: … / gzip: …" line. */
  wranglerSummary: string | null;
}

/**
 * Bundles the Worker into `outdir` exactly as `wrangler deploy` would, without uploading.
 * @example const bundle = buildWorkerBundle(); bundle.gzipBytes // 212345
 */
export function buildWorkerBundle(options: { outdir?: string; log?: (line: string) => void } = {}): WorkerBundle {
  ensureDemoModel({ log: options.log });
  const outdir = resolve(ROOT, options.outdir ?? "dist");
  rmSync(outdir, { recursive: true, force: true });
  const wrangler = join(ROOT, "node_modules", "wrangler", "bin", "wrangler.js");
  const run = spawnSync(process.execPath, [wrangler, "deploy", "--dry-run", "--outdir", outdir, "--config", join(ROOT, "wrangler.toml")], {
    cwd: ROOT,
    encoding: "utf8",
    env: { ...process.env, WRANGLER_SEND_METRICS: "false", NO_COLOR: "1", FORCE_COLOR: "0", CI: "1" },
  });
  if (run.status !== 0) throw new Error(`wrangler deploy --dry-run failed (exit ${run.status ?? run.signal}):\n${run.stdout}\n${run.stderr}`);
  const modules = readdirSync(outdir).filter((name) => !name.endsWith(".map") && name !== "README.md").map((name) => join(outdir, name));
  const entry = modules.find((path) => path.endsWith(".js"));
  if (entry === undefined) throw new Error(`wrangler wrote no JavaScript module into ${outdir}`);
  let rawBytes = 0;
  const contents: Buffer[] = [];
  for (const path of modules) {
    const bytes = readFileSync(path);
    rawBytes += bytes.length;
    contents.push(bytes);
  }
  // One gzip stream over all modules at level 9; wrangler's own figure is printed beside it.
  const gzipBytes = gzipSync(Buffer.concat(contents), { level: 9 }).length;
  const summary = /Total Upload: [^\n]*/.exec(`${run.stdout}\n${run.stderr}`)?.[0] ?? null;
  return { outdir, entry, modules, rawBytes, gzipBytes, wranglerSummary: summary };
}

function kibibytes(bytes: number): string {
  return `${(bytes / 1024).toFixed(1)} KiB`;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const args = process.argv.slice(2);
  const outdirIndex = args.indexOf("--outdir");
  const quiet = args.includes("--quiet");
  const log = (line: string) => {
    if (!quiet) process.stderr.write(`${line}\n`);
  };
  const bundle = buildWorkerBundle({ outdir: outdirIndex >= 0 ? args[outdirIndex + 1] : undefined, log });
  process.stdout.write(`worker bundle ${bundle.outdir}: ${bundle.modules.length} modules\n`);
  for (const path of bundle.modules) process.stdout.write(`  module ${basename(path)}: ${statSync(path).size} bytes\n`);
  process.stdout.write(`  raw  ${bundle.rawBytes} bytes (${kibibytes(bundle.rawBytes)})\n`);
  process.stdout.write(`  gzip ${bundle.gzipBytes} bytes (${kibibytes(bundle.gzipBytes)}), ceiling ${kibibytes(WORKER_GZIP_CEILING)}\n`);
  if (bundle.wranglerSummary) process.stdout.write(`  wrangler: ${bundle.wranglerSummary}\n`);
  if (bundle.gzipBytes > WORKER_GZIP_CEILING) {
    process.stderr.write(`build:worker: the gzip size ${bundle.gzipBytes} is over the ${WORKER_GZIP_CEILING}-byte ceiling\n`);
    process.exitCode = 1;
  }
}
