// A bounded load check of the Worker, not a test: 20,000 POST /v1/classify requests at
// concurrency 64 against the real bundle in a local Miniflare on loopback. Prints whether
// every answer was a 200 with the expected shape, p50/p99 latency, requests per second and
// the RSS of workerd and of this process before and after. Stops by itself after the
// request count or the time limit, whichever comes first.
// Run: node --import tsx scripts/load-check.ts [--requests N] [--concurrency N] [--seconds N]

import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Miniflare } from "miniflare";
import { buildWorkerBundle } from "./build-worker.ts";
import { integerFlag, loopbackWorkerOptions } from "./load-options.ts";
import { nearestRank } from "./bench/single-call-timing.ts";

const REQUESTS = integerFlag("--requests", 20_000, 200_000);
const CONCURRENCY = integerFlag("--concurrency", 64, 512);
const SECONDS = integerFlag("--seconds", 180, 900);

/** Resident set size in KiB of a process, from /proc (Linux). */
function rssKiB(pid: number | "self"): number | null {
  try {
    const match = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return match ? Number(match[1]) : null;
  } catch {
    return null;
  }
}

/** The workerd processes this process started (Miniflare spawns one). */
function workerdPids(): number[] {
  const pids: number[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const name = /\(([^)]*)\)/.exec(stat)?.[1];
      const parent = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      if (name === "workerd" && parent === process.pid) pids.push(Number(entry));
    } catch {
      // the process ended while we looked
    }
  }
  return pids;
}

function memory(): string {
  const workerd = workerdPids().map((pid) => rssKiB(pid));
  const format = (kib: number | null) => (kib === null ? "?" : `${(kib / 1024).toFixed(1)} MiB`);
  return `workerd RSS ${workerd.length > 0 ? workerd.map(format).join(" + ") : "?"}, this process RSS ${format(rssKiB("self"))}`;
}

const texts = readFileSync(new URL("../demo-data/contact-form.jsonl", import.meta.url), "utf8")
  .trim()
  .split("\n")
  .map((line) => (JSON.parse(line) as { message: string }).message);

const outdir = mkdtempSync(join(tmpdir(), "sluice-load-"));
const bundle = buildWorkerBundle({ outdir });
const miniflare = new Miniflare(loopbackWorkerOptions(bundle));
const url = new URL("/v1/classify", await miniflare.ready).href;
process.stdout.write(`load check: ${REQUESTS} requests, concurrency ${CONCURRENCY}, limit ${SECONDS} s, against ${url}\n`);
process.stdout.write(`before: ${memory()}\n`);

const latencies = new Float64Array(REQUESTS);
let issued = 0;
let completed = 0;
const failures = new Map<string, number>();
const deadline = performance.now() + SECONDS * 1000;
const started = performance.now();

async function client(): Promise<void> {
  while (issued < REQUESTS && performance.now() < deadline) {
    const index = issued++;
    const text = texts[index % texts.length];
    const begin = performance.now();
    let problem: string | null = null;
    try {
      const response = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ text }), signal: AbortSignal.timeout(30_000) });
      const body = (await response.json()) as { labels?: unknown[] };
      if (response.status !== 200) problem = `status ${response.status}`;
      else if (!Array.isArray(body.labels) || body.labels.length === 0) problem = "200 without labels";
    } catch (error) {
      problem = (error as Error).name;
    }
    latencies[completed++] = performance.now() - begin;
    if (problem !== null) failures.set(problem, (failures.get(problem) ?? 0) + 1);
  }
}

try {
  await Promise.all(Array.from({ length: CONCURRENCY }, client));
  const elapsed = (performance.now() - started) / 1000;
  const sorted = latencies.slice(0, completed).sort();
  const errors = [...failures.values()].reduce((a, b) => a + b, 0);
  process.stdout.write(`after:  ${memory()}\n`);
  process.stdout.write(`completed ${completed} of ${REQUESTS} in ${elapsed.toFixed(1)} s${completed < REQUESTS ? " (stopped at the time limit)" : ""}\n`);
  process.stdout.write(`errors: ${errors === 0 ? "none (zero-error check passed)" : `${errors} (${[...failures].map(([kind, n]) => `${kind}: ${n}`).join(", ")})`}\n`);
  process.stdout.write(`latency p50 ${nearestRank(sorted, 0.5).toFixed(2)} ms, p99 ${nearestRank(sorted, 0.99).toFixed(2)} ms, max ${sorted[sorted.length - 1].toFixed(2)} ms\n`);
  process.stdout.write(`throughput ${(completed / elapsed).toFixed(0)} requests/s\n`);
  if (errors > 0 || completed < REQUESTS) process.exitCode = 1;
} finally {
  await miniflare.dispose();
  rmSync(outdir, { recursive: true, force: true });
}
