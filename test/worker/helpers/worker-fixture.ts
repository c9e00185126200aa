// Runs the real Worker bundle (wrangler deploy --dry-run output, the bytes a deploy would
// upload) inside workerd through programmatic Miniflare, and captures Miniflare's log so
// e-mail forwards and rejects can be observed. One bundle per test process.

import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Log, LogLevel, Miniflare, type MiniflareOptions } from "miniflare";
import { loadModel } from "../../../runtime/format/load-model.ts";
import type { Model } from "../../../runtime/model/model.ts";
import { buildWorkerBundle, type WorkerBundle } from "../../../scripts/build-worker.ts";
import { DEMO_ROUTING_MODEL_PATH, ensureDemoModel } from "../../../scripts/demo-model.ts";

/** Same date as wrangler.toml. */
export const COMPATIBILITY_DATE = "2026-04-26";

let bundle: WorkerBundle | null = null;

/** The Worker bundle, built on first use into a temporary directory. */
export function workerBundle(): WorkerBundle {
  bundle ??= buildWorkerBundle({ outdir: mkdtempSync(join(tmpdir(), "sluice-worker-")) });
  return bundle;
}

/** Deletes the bundle directory; call from afterAll once every Miniflare is disposed. */
export function removeWorkerBundle(): void {
  if (bundle !== null) rmSync(bundle.outdir, { recursive: true, force: true });
  bundle = null;
}

let model: Model | null = null;
let routing: Model | null = null;

/** The bundled moderation model (built when missing), loaded in Node from the same file the bundle holds. */
export function demoModel(): Model {
  model ??= loadModel(readFileSync(ensureDemoModel()));
  return model;
}

/** The bundled routing (support-topics) model, loaded in Node from the same file the bundle holds. */
export function routingModel(): Model {
  ensureDemoModel();
  routing ??= loadModel(readFileSync(DEMO_ROUTING_MODEL_PATH));
  return routing;
}

/** Miniflare's log, kept in memory (forwards are logged at INFO, rejects at ERROR). */
export class CapturedLog extends Log {
  readonly entries: { level: LogLevel; message: string }[] = [];

  constructor() {
    super(LogLevel.INFO);
  }

  override logWithLevel(level: LogLevel, message: string): void {
    this.entries.push({ level, message });
  }

  clear(): void {
    this.entries.length = 0;
  }
}

export interface RunningWorker {
  miniflare: Miniflare;
  log: CapturedLog;
  /** dispatchFetch against a fixed origin. */
  fetch(path: string, init?: RequestInit): Promise<Response>;
}

/**
 * Starts the bundle in workerd with these bindings ([vars] as strings, plus any binding options).
 * @example const worker = await startWorker({ API_TOKEN: "t" }); await worker.fetch("/healthz")
 */
export async function startWorker(bindings: Record<string, string> = {}, options: Partial<MiniflareOptions> = {}): Promise<RunningWorker> {
  const log = new CapturedLog();
  const miniflare = new Miniflare({
    modules: true,
    scriptPath: workerBundle().entry,
    // Module names are paths relative to this root; the bundle lives outside the repo.
    modulesRoot: workerBundle().outdir,
    modulesRules: [{ type: "Data", include: ["**/*.sluice"] }],
    compatibilityDate: COMPATIBILITY_DATE,
    cf: false,
    unsafeTriggerHandlers: true,
    bindings,
    log,
    ...options,
  } as MiniflareOptions);
  try {
    await miniflare.ready;
  } catch (error) {
    // workerd's own explanation went to the captured log; put it in the failure.
    const details = log.entries.map((entry) => entry.message).join("\n");
    throw new Error(`${(error as Error).message}\n${details}`);
  }
  return {
    miniflare,
    log,
    fetch: async (path, init) => (await miniflare.dispatchFetch(`http://sluice.test${path}`, init as never)) as unknown as Response,
  };
}

/** JSON POST helper. */
export function jsonPost(body: unknown, headers: Record<string, string> = {}): RequestInit {
  return { method: "POST", headers: { "content-type": "application/json", ...headers }, body: JSON.stringify(body) };
}
