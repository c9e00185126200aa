// Parity: 500 demo texts scored by the Worker in workerd, by the runtime in Node, and by
// `sluice serve` on Node give the same labels, scores and token counts. The reference is
// the runtime running in Node (model.classify / model.score on the same model file).
// The routing model is only reached through e-mail: 60 support e-mails delivered to the
// Worker get the same destination and X-Sluice-* headers as handleEmail running in Node.

import { readFileSync } from "node:fs";
import { parse } from "csv-parse/sync";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Model } from "../../runtime/model/model.ts";
import { appConfigFromEnv } from "../../runtime/worker/app-config.ts";
import { handleEmail } from "../../runtime/worker/handle-email.ts";
import { DEMO_MODEL_PATH } from "../../scripts/demo-model.ts";
import { deliverEmail, rfc822Message } from "./helpers/email-delivery.ts";
import { fakeEmailMessage } from "./helpers/fake-email-message.ts";
import { startServe, type ServeProcess } from "./helpers/serve-process.ts";
import { demoModel, jsonPost, routingModel, startWorker, removeWorkerBundle, type RunningWorker } from "./helpers/worker-fixture.ts";

const BATCH = 100; // the default MAX_TEXTS
const EMAIL_VARS = {
  EMAIL_ROUTES: JSON.stringify({ billing: "billing@vellumcroft.example", shipping: "shipping@vellumcroft.example", returns: "returns@vellumcroft.example", "account-access": "accounts@vellumcroft.example", "technical-fault": "repairs@vellumcroft.example", "product-question": "product-help@vellumcroft.example" }),
  EMAIL_FALLBACK: "triage@vellumcroft.example",
};

function supportRows(): { subject: string; body: string }[] {
  return parse(readFileSync(new URL("../../demo-data/support-topics.csv", import.meta.url)), { columns: true }) as { subject: string; body: string }[];
}

/**
 * A support e-mail as RFC 5322 text: the subject as an RFC 2047 "B" encoded word (UTF-8),
 * the body base64 in 76-character lines (RFC 2045 §6.8), so any character survives transport.
 */
function supportMessage(row: { subject: string; body: string }): string {
  const subject = `=?UTF-8?B?${Buffer.from(row.subject, "utf8").toString("base64")}?=`;
  const body = Buffer.from(row.body.replace(/\r?\n/g, "\r\n"), "utf8").toString("base64").match(/.{1,76}/g) ?? [];
  return rfc822Message([`Subject: ${subject}`, "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: base64"], body);
}

/** 400 contact-form messages and 100 support e-mails (subject and body), in file order. */
function demoTexts(): string[] {
  const contact = readFileSync(new URL("../../demo-data/contact-form.jsonl", import.meta.url), "utf8")
    .trim()
    .split("\n")
    .slice(0, 400)
    .map((line) => (JSON.parse(line) as { message: string }).message);
  const support = supportRows().slice(0, 100).map((row) => `${row.subject}\n${row.body}`);
  return [...contact, ...support];
}

let worker: RunningWorker;
let server: ServeProcess;
let model: Model;
const texts = demoTexts();
const workerdBodies: string[] = [];

beforeAll(async () => {
  model = demoModel();
  // The e-mail variables change nothing on the HTTP side, which must still equal sluice serve.
  [worker, server] = await Promise.all([startWorker(EMAIL_VARS), startServe(DEMO_MODEL_PATH)]);
  for (let start = 0; start < texts.length; start += BATCH) {
    const response = await worker.fetch("/v1/classify", jsonPost({ texts: texts.slice(start, start + BATCH), top: 3 }));
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
    const fromNode = texts.map((text) => JSON.parse(JSON.stringify(model.classify(text, { top: 3 }))));
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
      const response = await fetch(`${server.url}/v1/classify`, jsonPost({ texts: texts.slice(start, start + BATCH), top: 3 }));
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

describe("workerd and Node, through the e-mail handler", () => {
  it("route 60 support e-mails alike, with the same topics, scores and headers", async () => {
    const models = { moderation: model, routing: routingModel() };
    const config = appConfigFromEnv(EMAIL_VARS).email;
    const destinations = new Set<string>();
    for (const row of supportRows().slice(100, 160)) {
      const raw = supportMessage(row);
      const delivery = await deliverEmail(worker, raw);
      const { message, calls } = fakeEmailMessage(raw);
      await handleEmail(models, config, message);
      expect(delivery.forwardedTo).toBe(calls.forwardedTo);
      // Miniflare prints header names lower-cased, as Headers stores them (Fetch standard §5.2).
      expect(delivery.headers).toEqual(Object.fromEntries(calls.headers as Headers));
      destinations.add(delivery.forwardedTo as string);
    }
    // The sample reaches several teams and the fallback, so more than one path is compared.
    expect(destinations.size).toBeGreaterThan(3);
    expect(destinations.has(config.fallback as string)).toBe(true);
  });
});
