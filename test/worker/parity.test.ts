// Parity: 500 demo texts scored by the Worker in workerd, by the runtime in Node, and by
// `sluice serve` on Node give the same labels, scores and token counts. The reference is
// the runtime running in Node (model.classify / model.score on the same model file).

import { readFileSync } from "node:fs";
import { parse } from "csv-parse/sync";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Model } from "../../runtime/model.ts";
import { DEMO_MODEL_PATH } from "../../scripts/demo-model.ts";
import { startServe, type ServeProcess } from "./helpers/serve-process.ts";
import { demoModel, jsonPost, startWorker, removeWorkerBundle, type RunningWorker } from "./helpers/worker-fixture.ts";

const BATCH = 100; // the default MAX_TEXTS

/** 400 contact-form messages and 100 support e-mails (subject and body), in file order. */
function demoTexts(): string[] {
  const contact = readFileSync(new URL("../../demo-data/contact-form.jsonl", import.meta.url), "utf8")
    .trim()
    .split("\n")
    .slice(0, 400)
    .map((line) => (JSON.parse(line) as { message: string }).message);
  const rows = parse(readFileSync(new URL("../../demo-data/support-topics.csv", import.meta.url)), { columns: true }) as { subject: string; body: string }[];
  const support = rows.slice(0, 100).map((row) => `${row.subject}\n${row.body}`);
  return [...contact, ...support];
}

let worker: RunningWorker;
let server: ServeProcess;
let model: Model;
const texts = demoTexts();
const workerdBodies: string[] = [];

beforeAll(async () => {
  model = demoModel();
  [worker, server] = await Promise.all([startWorker(), startServe(DEMO_MODEL_PATH)]);
  for (let start = 0; start < texts.length; start += BATCH) {
    const response = await worker.fetch("/v1/classify", jsonPost({ texts: texts.slice(start, start + BATCH) }));
    expect(response.status).toBe(200);
    workerdBodies.push(await response.text());
  }
});

afterAll(async () => {
  await Promise.all([worker?.miniflare.dispose(), server?.stop()]);
  removeWorkerBundle();
});

describe("workerd and Node", () => {
  it("classify 500 demo texts with identical labels and scores", () => {
    expect(texts.length).toBe(500);
    const fromWorkerd = workerdBodies.flatMap((body) => (JSON.parse(body) as { results: { labels: unknown }[] }).results.map((result) => result.labels));
    const fromNode = texts.map((text) => JSON.parse(JSON.stringify(model.classify(text, { top: model.labels.length }))));
    expect(fromWorkerd).toHaveLength(500);
    // Exact equality: both sides print the same float32 scores as JSON numbers.
    expect(fromWorkerd).toEqual(fromNode);
  });

  it("report the same token counts, truncation and known features", () => {
    const fromWorkerd = workerdBodies.flatMap((body) => (JSON.parse(body) as { results: { tokenCount: number; truncated: boolean; knownFeatures: number }[] }).results.map(({ tokenCount, truncated, knownFeatures }) => ({ tokenCount, truncated, knownFeatures })));
    const fromNode = texts.map((text) => {
      const { tokenCount, truncated, knownFeatures } = model.score(text);
      return { tokenCount, truncated, knownFeatures };
    });
    expect(fromWorkerd).toEqual(fromNode);
  });

  it("give byte-identical /v1/classify responses from the Worker and from sluice serve", async () => {
    for (let start = 0, batch = 0; start < texts.length; start += BATCH, batch++) {
      const response = await fetch(`${server.url}/v1/classify`, jsonPost({ texts: texts.slice(start, start + BATCH) }));
      expect(response.status).toBe(200);
      expect(await response.text()).toBe(workerdBodies[batch]);
    }
  });

  it("give identical /v1/model, /healthz and error answers from the Worker and from sluice serve", async () => {
    for (const [path, init] of [["/v1/model", undefined], ["/healthz", undefined], ["/v1/classify", jsonPost({ text: "" })], ["/v1/nothing", undefined]] as const) {
      const fromWorkerd = await worker.fetch(path, init);
      const fromNode = await fetch(`${server.url}${path}`, init);
      expect(fromNode.status).toBe(fromWorkerd.status);
      expect(await fromNode.text()).toBe(await fromWorkerd.text());
    }
  });
});
