// The demo model the Worker bundles: contact-form moderation (ok / spam / abusive), built
// from the demo data with the CLI. Built when missing (about two seconds); one thread, the
// default seed and a fixed SOURCE_DATE_EPOCH make it byte-identical on every machine, so it
// is not committed (demo-data/models/.gitignore). It has its own file name so that
// `npm run demo`, which writes its own demo models next to it, never replaces it.
// Run directly: `node --import tsx scripts/demo-model.ts [--force]`.

import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, statSync } from "node:fs";
import { dirname, join, relative } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const ROOT = join(dirname(fileURLToPath(import.meta.url)), "..");

/** Where runtime/worker.ts imports the model from. */
export const DEMO_MODEL_PATH = join(ROOT, "demo-data", "models", "worker-contact-form.sluice");

const DEMO_DATA_PATH = join(ROOT, "demo-data", "contact-form.jsonl");

/** 2026-01-01T00:00:00Z: the build time recorded in the demo model's provenance. */
const DEMO_BUILD_EPOCH = "1767225600";

/**
 * The CLI arguments of the demo build: spam is blocked only where validation precision
 * reaches 99%; below that, from the score that catches 90% of spam, it goes to human
 * review. Abusive messages are never blocked automatically: from the score that catches 90%
 * of them they go to review. Anything with a top score under 0.6 goes to review too.
 */
export const DEMO_MODEL_ARGS = [
  "build",
  DEMO_DATA_PATH,
  "--text-field", "message",
  "--label-field", "label",
  "--target-precision", "spam=0.99",
  "--target-recall", "spam=0.9,abusive=0.9",
  "--review-below", "0.6",
  "--threads", "1",
  "--quiet",
  "--force",
];

/**
 * Builds the demo model unless it exists and is newer than its data and this recipe (or
 * `force`); returns its path.
 * @example ensureDemoModel() // "/…/demo-data/models/worker-contact-form.sluice"
 */
export function ensureDemoModel(options: { force?: boolean; log?: (line: string) => void } = {}): string {
  if (!options.force && isUpToDate()) return DEMO_MODEL_PATH;
  mkdirSync(dirname(DEMO_MODEL_PATH), { recursive: true });
  options.log?.(`building the demo model ${relative(ROOT, DEMO_MODEL_PATH)} from demo-data/contact-form.jsonl`);
  const run = spawnSync(process.execPath, [join(ROOT, "bin", "sluice.js"), ...DEMO_MODEL_ARGS, "--out", DEMO_MODEL_PATH], {
    cwd: ROOT,
    encoding: "utf8",
    env: { ...process.env, SOURCE_DATE_EPOCH: DEMO_BUILD_EPOCH },
  });
  if (run.status !== 0) {
    throw new Error(`building the demo model failed (exit ${run.status ?? run.signal}):\n${run.stderr}${run.stdout}`);
  }
  return DEMO_MODEL_PATH;
}

function isUpToDate(): boolean {
  if (!existsSync(DEMO_MODEL_PATH)) return false;
  const built = statSync(DEMO_MODEL_PATH).mtimeMs;
  return [DEMO_DATA_PATH, fileURLToPath(import.meta.url)].every((source) => statSync(source).mtimeMs <= built);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  ensureDemoModel({ force: process.argv.includes("--force"), log: (line) => process.stderr.write(`${line}\n`) });
}
