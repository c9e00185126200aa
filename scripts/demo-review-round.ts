// The production review loop, end to end on the demo contact form, as an operator would run
// it: the Worker (the real bundle, in a local workerd through Miniflare, with a fresh D1
// database as REVIEWS and the shadow candidate on) moderates demo messages → the uncertain
// ones wait in the review queue → a reviewer labels them through the reviewer API (here the
// demo data's own labels stand in for a person) → the decisions are exported as JSONL →
// `sluice eval` measures the live model on them → `sluice build --also` retrains with them →
// `sluice compare` gates the rebuilt model against the live one. Prints each step.
// Run: npm run demo:review-round [-- --messages N]   (writes into out/review-round/, git-ignored)

import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { Miniflare } from "miniflare";
import type { D1Database } from "../runtime/worker/reviews/d1-types.ts";
import { buildWorkerBundle } from "./build-worker.ts";
import { DEMO_MODEL_PATH, ensureDemoModel } from "./demo-model.ts";
import { integerFlag, loopbackWorkerOptions } from "./load-options.ts";
import { migrationStatements } from "./review-migrations.ts";

const ROOT = new URL("..", import.meta.url).pathname;
const OUT = join(ROOT, "out", "review-round"); // git-ignored
const MESSAGES = integerFlag("--messages", 400, 5000);
const REVIEWER_TOKEN = "demo-reviewer-token-change-me";
const say = (line = "") => process.stdout.write(`${line}\n`);

/** Runs the CLI from this checkout; exits with its output when it fails. */
function sluice(args: string[]): string {
  const run = spawnSync(process.execPath, [join(ROOT, "bin", "sluice.js"), ...args], { cwd: ROOT, encoding: "utf8" });
  if (run.status !== 0 && !(args[0] === "compare" && run.status === 4)) {
    throw new Error(`sluice ${args.join(" ")} failed (exit ${run.status}):\n${run.stderr}${run.stdout}`);
  }
  return run.stdout;
}

/**
 * fetch, tried once more on a fresh connection when a GET's pooled keep-alive connection
 * turns out closed by workerd while the CLI steps ran (undici reports "other side closed";
 * a GET is safe to repeat).
 */
async function fetchOnce(url: URL, init: RequestInit): Promise<Response> {
  try {
    return await fetch(url, init);
  } catch (error) {
    const code = (error as { cause?: { code?: string } }).cause?.code;
    if ((init.method ?? "GET") !== "GET" || code !== "UND_ERR_SOCKET") throw error;
    return fetch(url, { ...init, headers: { ...(init.headers as Record<string, string>), connection: "close" } });
  }
}

ensureDemoModel({ log: say });
const messages = readFileSync(join(ROOT, "demo-data", "contact-form.jsonl"), "utf8")
  .trim()
  .split("\n")
  .map((line) => JSON.parse(line) as { message: string; label: string })
  .slice(0, MESSAGES);
const truth = new Map(messages.map((m) => [m.message, m.label]));
mkdirSync(OUT, { recursive: true });
const bundleDir = mkdtempSync(join(tmpdir(), "sluice-review-round-"));
const miniflare = new Miniflare(
  loopbackWorkerOptions(buildWorkerBundle({ outdir: bundleDir }), {
    bindings: { REVIEWER_TOKEN, REVIEW_STORE_TEXT: "on", CANDIDATE: "shadow" },
    d1Databases: ["REVIEWS"],
  }),
);
try {
  const base = await miniflare.ready;
  const db = (await miniflare.getD1Database("REVIEWS")) as unknown as D1Database;
  await db.batch(migrationStatements().map((sql) => db.prepare(sql)));
  const reviewer = { authorization: `Bearer ${REVIEWER_TOKEN}` };
  const call = async (path: string, init: RequestInit = {}) => {
    const response = await fetchOnce(new URL(path, base), init);
    if (!response.ok) throw new Error(`${init.method ?? "GET"} ${path}: ${response.status} ${await response.text()}`);
    return response;
  };

  say(`1. moderate: ${messages.length} demo contact-form messages → POST /v1/moderate (workerd, D1 review queue, shadow candidate)`);
  const actions: Record<string, number> = {};
  for (const { message } of messages) {
    const decision = (await (await call("/v1/moderate", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ text: message }) })).json()) as { action: string };
    actions[decision.action] = (actions[decision.action] ?? 0) + 1;
  }
  say(`   actions: ${Object.entries(actions).map(([action, n]) => `${action} ${n}`).join(", ")}`);

  say("2. review: a reviewer takes the queue one item at a time (GET /v1/reviews with a lease, POST /v1/reviews/{id})");
  let lease = "";
  let decided = 0;
  for (;;) {
    const page = (await (await call(`/v1/reviews?status=pending&limit=1${lease ? `&lease=${lease}` : ""}`, { headers: reviewer })).json()) as {
      items: { id: number; text: string; label: string; score: number; drivers?: { label: string; features: { feature: string; foldedFrom?: string[] }[] }[] }[];
      lease: { id: string };
    };
    lease = page.lease.id;
    const [item] = page.items;
    if (item === undefined) break;
    const label = truth.get(item.text) as string;
    if (decided < 3) {
      const drivers = item.drivers?.[0]?.features.map((f) => f.feature).join(", ") ?? "—";
      say(`   #${item.id} model: ${item.label} ${item.score.toFixed(2)} (pushed by ${drivers}) → reviewer: ${label}  "${item.text.slice(0, 60)}${item.text.length > 60 ? "…" : ""}"`);
    }
    await call(`/v1/reviews/${item.id}`, { method: "POST", headers: { ...reviewer, "content-type": "application/json" }, body: JSON.stringify({ label, lease }) });
    decided++;
  }
  say(`   ${decided} items decided`);

  const exportPath = join(OUT, "reviews.jsonl");
  writeFileSync(exportPath, await (await call("/v1/reviews/export", { headers: reviewer })).text());
  say(`3. export: GET /v1/reviews/export → ${relative(ROOT, exportPath)}`);

  const evaluated = JSON.parse(sluice(["eval", DEMO_MODEL_PATH, exportPath, "--json", "--quiet"])) as { examples: number; accuracy: number };
  say(`4. eval: the live model on the reviewed traffic (what was hard for it): accuracy ${evaluated.accuracy.toFixed(3)} on ${evaluated.examples}`);

  const rebuiltPath = join(OUT, "rebuilt.sluice");
  const built = JSON.parse(sluice(["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--also", exportPath, "--also-weight", "3", "--json", "--quiet", "--force", "--out", rebuiltPath])) as { trainExamples: number };
  say(`5. rebuild: sluice build demo-data/contact-form.jsonl --also reviews.jsonl --also-weight 3 → ${relative(ROOT, rebuiltPath)} (${built.trainExamples} training examples)`);

  const compared = JSON.parse(sluice(["compare", DEMO_MODEL_PATH, rebuiltPath, exportPath, "--max-regression", "0.01", "--json", "--quiet"])) as { examples: number; live: { accuracy: number }; candidate: { accuracy: number } };
  const drop = compared.live.accuracy - compared.candidate.accuracy;
  say(`6. compare on the reviewed traffic: live ${compared.live.accuracy.toFixed(3)}, rebuilt ${compared.candidate.accuracy.toFixed(3)} → ${drop > 0.01 ? "the gate refuses it (exit 4)" : "the gate passes it"}`);
  say("   (the rebuilt model trained on these very reviews: judge it on held-out traffic, or on the next round's reviews, before promoting it)");

  const shadow = (await (await call("/v1/shadow", { headers: reviewer })).json()) as unknown;
  writeFileSync(join(OUT, "shadow.json"), JSON.stringify(shadow, null, 2));
  writeFileSync(join(OUT, "stats.json"), JSON.stringify(await (await call("/v1/stats", { headers: reviewer })).json(), null, 2));
  say(`7. shadow and traffic counts: ${relative(ROOT, join(OUT, "shadow.json"))}, stats.json (npx sluice traffic-report ${relative(ROOT, DEMO_MODEL_PATH)} --stats ${relative(ROOT, join(OUT, "stats.json"))} --shadow ${relative(ROOT, join(OUT, "shadow.json"))} --out traffic.html)`);
} finally {
  await miniflare.dispose();
  rmSync(bundleDir, { recursive: true, force: true });
}
