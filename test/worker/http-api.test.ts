// The Worker's HTTP API in real workerd (Miniflare running the wrangler dry-run bundle):
// every route, every error status, auth on and off, CORS, secure headers, rate limiting.
// Status codes and headers are checked against the HTTP RFCs cited beside each case.

import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { summarizeTrainingFingerprint } from "../../compiler/read/text-fingerprints.ts";
import type { Model } from "../../runtime/model/model.ts";
import { WORKER_GZIP_CEILING } from "../../scripts/build-worker.ts";
import { DEMO_MODEL_PATH, DEMO_ROUTING_MODEL_PATH, DEMO_CANDIDATE_MODEL_PATH } from "../../scripts/demo-model.ts";
import { demoModel, jsonPost, startWorker, workerBundle, removeWorkerBundle, type RunningWorker } from "./helpers/worker-fixture.ts";

const VARS = { MODERATE_FIELDS: "subject,message", MAX_TEXTS: "5", MAX_BODY_BYTES: "65536" };
const SPAM = "WIN a FREE prize!!! Click www.example.net/win to claim your reward now";
const QUESTION = "Hello, could you tell me when the Mossel desk lamp will be back in stock? Thanks, Ines";

let worker: RunningWorker;
let model: Model;

beforeAll(async () => {
  model = demoModel();
  worker = await startWorker(VARS);
});

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

/** Checks the error envelope every failure uses, and that no stack trace leaks. */
async function expectError(response: Response, status: number, code: string): Promise<{ code: string; message: string }> {
  expect(response.status).toBe(status);
  expect(response.headers.get("content-type")).toMatch(/^application\/json/);
  const text = await response.text();
  expect(text).not.toMatch(/\n\s+at /); // V8 stack frames look like "\n    at fn (file:line)"
  const body = JSON.parse(text) as { error: { code: string; message: string } };
  expect(Object.keys(body)).toEqual(["error"]);
  expect(body.error.code).toBe(code);
  expect(body.error.message.length).toBeGreaterThan(10);
  return body.error;
}

/** Size of the model's training fingerprint, read by the compiler's own decoder (compiler/read/text-fingerprints.ts). */
function fingerprintBytes(served: Model): number {
  const summary = summarizeTrainingFingerprint(served.meta.provenance.trainFingerprint);
  if (summary === null || "error" in summary) throw new Error(`the demo model has no readable training fingerprint: ${JSON.stringify(summary)}`);
  return summary.bytes;
}

/** The most entries of any array or object anywhere in a parsed JSON value. */
function largestCollection(value: unknown): number {
  if (typeof value !== "object" || value === null) return 0;
  const children = Object.values(value);
  return Math.max(children.length, ...children.map(largestCollection));
}

describe("the Worker bundle", () => {
  it("stays under the 1 MiB gzip ceiling and carries the live, routing and candidate models as separate Data modules", () => {
    const bundle = workerBundle();
    expect(bundle.gzipBytes).toBeLessThanOrEqual(WORKER_GZIP_CEILING);
    // The uploaded Data modules are the three model files themselves, byte for byte.
    const shipped = bundle.modules.filter((path) => path.endsWith(".sluice")).map((path) => readFileSync(path));
    const models = [DEMO_MODEL_PATH, DEMO_ROUTING_MODEL_PATH, DEMO_CANDIDATE_MODEL_PATH].map((path) => readFileSync(path));
    expect(shipped).toHaveLength(3);
    for (const file of models) expect(shipped.some((module) => module.equals(file))).toBe(true);
  });
});

describe("GET /healthz and GET /v1/model", () => {
  it("reports health with the model version", async () => {
    const response = await worker.fetch("/healthz");
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ status: "ok", version: model.meta.version, labels: 3 });
  });

  it("describes the model's labels, version, metrics, policy and provenance", async () => {
    const body = (await (await worker.fetch("/v1/model")).json()) as Record<string, unknown>;
    expect(body.version).toBe(model.meta.version);
    expect(body.labels).toEqual(["abusive", "ok", "spam"]);
    expect(body.metrics).toEqual(model.meta.metrics);
    // Every provenance key the compiler writes, the fingerprint as its size only.
    expect(body.provenance).toEqual({ ...model.meta.provenance, trainFingerprint: { bytes: fingerprintBytes(model) } });
    expect(body.policy).toEqual(model.meta.policy);
    expect(body.maxTokens).toBe(model.meta.featurizer.maxTokens);
  });

  it("serves the training fingerprint as its size, never its bits", async () => {
    // Precondition: the demo model carries a Bloom filter of its training texts, thousands of bytes.
    const bytes = fingerprintBytes(model);
    expect(bytes).toBeGreaterThan(1000);
    const text = await (await worker.fetch("/v1/model")).text();
    const body = JSON.parse(text) as { provenance: Record<string, unknown> };
    expect(body.provenance.trainFingerprint).toEqual({ bytes });
    // As JSON the bits would take at least two characters a byte ("0," or "\"0\":0,"): a leak could not fit.
    expect(text.length).toBeLessThan(2 * bytes);
    // Neither Node's Buffer JSON ({ "type": "Buffer", "data": [...] }) nor a typed array's ({ "0": …, "1": … }).
    expect(text).not.toMatch(/"data":\s*\[/);
    expect(largestCollection(body)).toBeLessThan(64);
  });

  it("never returns training texts", async () => {
    const text = await (await worker.fetch("/v1/model")).text();
    const training = readFileSync(new URL("../../demo-data/contact-form.jsonl", import.meta.url), "utf8").trim().split("\n").slice(0, 50);
    for (const line of training) expect(text).not.toContain((JSON.parse(line) as { message: string }).message);
  });
});

describe("POST /v1/classify", () => {
  it("returns the labels the library lists by default, with the policy decision and what was read", async () => {
    const body = (await (await worker.fetch("/v1/classify", jsonPost({ text: QUESTION }))).json()) as Record<string, any>;
    expect(body.version).toBe(model.meta.version);
    // One default for every surface (runtime/surface-defaults.ts): a softmax head lists its best label.
    expect(body.labels).toEqual(JSON.parse(JSON.stringify(model.classify(QUESTION))));
    expect(body.labels).toHaveLength(1);
  });

  it("returns every label best first when asked with top", async () => {
    const body = (await (await worker.fetch("/v1/classify", jsonPost({ text: QUESTION, top: 3 }))).json()) as Record<string, any>;
    expect(body.labels.map((entry: { label: string }) => entry.label)).toEqual(model.classify(QUESTION, { top: 3 }).map((entry) => entry.label));
    // Softmax scores sum to one (definition of softmax; common practice, no source). Float32 rounding allows 1e-6.
    expect(Math.abs(body.labels.reduce((sum: number, entry: { score: number }) => sum + entry.score, 0) - 1)).toBeLessThan(1e-6);
    expect(body.decision.action).toBe("allow");
    expect(body.tokenCount).toBe(model.score(QUESTION).tokenCount);
    expect(body.truncated).toBe(false);
  });

  it("classifies several texts in one call, in order", async () => {
    const body = (await (await worker.fetch("/v1/classify", jsonPost({ texts: [QUESTION, SPAM] }))).json()) as { results: { labels: { label: string }[] }[] };
    expect(body.results.map((result) => result.labels[0].label)).toEqual(["ok", "spam"]);
  });

  it("honours top and minScore", async () => {
    const body = (await (await worker.fetch("/v1/classify", jsonPost({ text: SPAM, top: 2, minScore: 0.01 }))).json()) as { labels: { label: string; score: number }[] };
    expect(body.labels.length).toBeLessThanOrEqual(2);
    expect(body.labels.every((entry) => entry.score >= 0.01)).toBe(true);
    expect(body.labels[0].label).toBe("spam");
  });

  it("cuts a very long text at the model's token limit and says so", async () => {
    const long = Array.from({ length: 3000 }, (_, i) => `word${i % 97}`).join(" ");
    const body = (await (await worker.fetch("/v1/classify", jsonPost({ text: long }))).json()) as { truncated: boolean; tokenCount: number };
    expect(body.truncated).toBe(true);
    expect(body.tokenCount).toBe(model.score(long).tokenCount);
    expect(body.tokenCount).toBeLessThanOrEqual(model.meta.featurizer.maxTokens);
  });

  // RFC 9110 §15.5.14: 413 Content Too Large.
  it("answers 413 for more texts than MAX_TEXTS", async () => {
    const error = await expectError(await worker.fetch("/v1/classify", jsonPost({ texts: ["a", "b", "c", "d", "e", "f"] })), 413, "too-many-texts");
    expect(error.message).toContain("at most 5");
  });

  it("answers 413 for a body over MAX_BODY_BYTES", async () => {
    await expectError(await worker.fetch("/v1/classify", jsonPost({ text: "x".repeat(70_000) })), 413, "body-too-large");
  });

  // RFC 9110 §15.5.16: 415 Unsupported Media Type.
  it("answers 415 for a body that is not JSON", async () => {
    await expectError(await worker.fetch("/v1/classify", { method: "POST", headers: { "content-type": "text/plain" }, body: QUESTION }), 415, "unsupported-media-type");
  });

  it("answers 415 when the Content-Type is missing", async () => {
    await expectError(await worker.fetch("/v1/classify", { method: "POST", body: new TextEncoder().encode('{"text":"hi"}') }), 415, "unsupported-media-type");
  });

  // RFC 9110 §15.5.1: 400 Bad Request for a message the server cannot parse (RFC 8259 grammar).
  it("answers 400 for malformed JSON", async () => {
    await expectError(await worker.fetch("/v1/classify", { method: "POST", headers: { "content-type": "application/json" }, body: '{"text": "unterminated' }), 400, "malformed-body");
  });

  // RFC 9110 §15.5.21: 422 Unprocessable Content, well-formed but unusable.
  it("answers 422 when the text is missing", async () => {
    const error = await expectError(await worker.fetch("/v1/classify", jsonPost({ message: QUESTION })), 422, "missing-text");
    expect(error.message).toContain('"text"');
  });

  it("answers 422 for an empty text", async () => {
    await expectError(await worker.fetch("/v1/classify", jsonPost({ text: "   " })), 422, "missing-text");
  });

  it("answers 422 naming the position of a text that is not a string", async () => {
    const error = await expectError(await worker.fetch("/v1/classify", jsonPost({ texts: ["fine", 42] })), 422, "invalid-input");
    expect(error.message).toContain("texts[1]");
  });

  it("answers 422 for a JSON body that is not an object", async () => {
    await expectError(await worker.fetch("/v1/classify", jsonPost([QUESTION])), 422, "invalid-input");
  });

  it("answers 422 for an option out of range", async () => {
    const error = await expectError(await worker.fetch("/v1/classify", jsonPost({ text: QUESTION, top: 9 })), 422, "invalid-input");
    expect(error.message).toContain('"top"');
  });
});

describe("POST /v1/moderate", () => {
  const subject = "Stock question";

  it("reads the configured fields from JSON and returns action, label, score, reasons and the review note", async () => {
    const body = (await (await worker.fetch("/v1/moderate", jsonPost({ subject, message: QUESTION, name: "Ines" }))).json()) as Record<string, any>;
    const expected = model.decide(`${subject}\n\n${QUESTION}`);
    expect(body.action).toBe(expected.action);
    expect(body.label).toBe(expected.label);
    expect(body.score).toBe(expected.score);
    expect(Array.isArray(body.reasons)).toBe(true);
    expect(body.humanReview.note).toMatch(/person/);
  });

  it("gives the same answer for URL-encoded and multipart forms", async () => {
    const json = await (await worker.fetch("/v1/moderate", jsonPost({ subject, message: SPAM }))).json();
    // application/x-www-form-urlencoded per the WHATWG URL standard, §5 (URLSearchParams serializes it).
    const form = await (await worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: new URLSearchParams({ subject, message: SPAM }).toString() })).json();
    // multipart/form-data per RFC 7578, written out by hand (§4.1 boundary, §4.2 Content-Disposition).
    const boundary = "sluice-boundary-7578";
    const multipartBody = [`--${boundary}`, 'Content-Disposition: form-data; name="subject"', "", subject, `--${boundary}`, 'Content-Disposition: form-data; name="message"', "", SPAM, `--${boundary}--`, ""].join("\r\n");
    const multipart = await (await worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": `multipart/form-data; boundary=${boundary}` }, body: multipartBody })).json();
    expect(form).toEqual(json);
    expect(multipart).toEqual(json);
  });

  it("blocks only what the policy blocks", async () => {
    const body = (await (await worker.fetch("/v1/moderate", jsonPost({ message: SPAM }))).json()) as { action: string; label: string };
    expect(model.decide(SPAM).action).toBe("block");
    expect(body).toMatchObject({ action: "block", label: "spam" });
  });

  it("sends an uncertain text to review, flagged for a person, instead of blocking it", async () => {
    const body = (await (await worker.fetch("/v1/moderate", jsonPost({ message: "hello" }))).json()) as { action: string; score: number; humanReview: { required: boolean } };
    expect(body.score).toBeLessThan(0.6);
    expect(body.action).toBe("review");
    expect(body.humanReview.required).toBe(true);
  });

  it("answers 422 when none of the configured fields has text", async () => {
    const error = await expectError(await worker.fetch("/v1/moderate", jsonPost({ text: QUESTION })), 422, "missing-text");
    expect(error.message).toContain('"subject", "message"');
  });

  it("answers 422 for a file upload in a text field", async () => {
    // RFC 7578 §4.2: a part with a filename parameter is a file.
    const boundary = "sluice-file-7578";
    const body = [`--${boundary}`, 'Content-Disposition: form-data; name="message"; filename="message.txt"', "Content-Type: text/plain", "", "hello", `--${boundary}--`, ""].join("\r\n");
    const error = await expectError(await worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": `multipart/form-data; boundary=${boundary}` }, body }), 422, "invalid-input");
    expect(error.message).toContain("file");
  });

  it("answers 400 for a multipart body that breaks its own boundary", async () => {
    const body = "--abc\r\nContent-Disposition: form-data; name=\"message\"\r\n\r\nhello";
    await expectError(await worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": "multipart/form-data; boundary=abc" }, body }), 400, "malformed-body");
  });

  it("answers 415 for XML", async () => {
    await expectError(await worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": "application/xml" }, body: "<message>hi</message>" }), 415, "unsupported-media-type");
  });
});

describe("POST /v1/explain", () => {
  it("lists the features behind each top label, adding up to the logit", async () => {
    // A short text has fewer than 50 features, so all of them are listed.
    const body = (await (await worker.fetch("/v1/explain", jsonPost({ text: "free prize!!!", top: 1, features: 50 }))).json()) as { labels: { label: string; logit: number; bias: number; features: { contribution: number }[] }[] };
    const [top] = body.labels;
    expect(top.label).toBe("spam");
    expect(top.features.length).toBeGreaterThan(0);
    // The model is linear before the softmax, so logit = bias + Σ contributions (runtime/model/model.ts header comment).
    const sum = top.features.reduce((total, feature) => total + feature.contribution, top.bias);
    expect(sum).toBeCloseTo(top.logit, 4);
  });
});

describe("GET / (playground page)", () => {
  it("serves HTML whose inline script and style carry the CSP nonce, without unsafe-inline", async () => {
    const response = await worker.fetch("/");
    expect(response.headers.get("content-type")).toMatch(/^text\/html/);
    const csp = response.headers.get("content-security-policy") as string;
    // CSP Level 3 §2.3.1: a nonce-source is 'nonce-<base64-value>'.
    const nonce = /script-src 'nonce-([A-Za-z0-9+/=]+)'/.exec(csp)?.[1];
    expect(nonce).toBeDefined();
    expect(csp).not.toContain("unsafe-inline");
    const html = await response.text();
    expect(html).toContain(`<script nonce="${nonce}">`);
    expect(html).toContain(`<style nonce="${nonce}">`);
  });

  it("uses a fresh nonce for every response", async () => {
    const first = (await worker.fetch("/")).headers.get("content-security-policy");
    const second = (await worker.fetch("/")).headers.get("content-security-policy");
    expect(first).not.toBe(second);
  });
});

describe("errors and headers on every route", () => {
  // RFC 9110 §15.5.5: 404 Not Found.
  it("answers 404 as JSON for an unknown path", async () => {
    await expectError(await worker.fetch("/v2/classify"), 404, "not-found");
  });

  // RFC 9110 §15.5.6: a 405 response MUST carry an Allow header.
  it("answers 405 with Allow for the wrong method", async () => {
    const response = await worker.fetch("/v1/classify");
    expect(response.headers.get("allow")).toBe("POST");
    await expectError(response, 405, "method-not-allowed");
  });

  it("sets the secure headers on API responses", async () => {
    const response = await worker.fetch("/healthz");
    // Values are hono/secure-headers defaults (hono docs, Secure Headers Middleware).
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(response.headers.get("x-frame-options")).toBe("DENY");
    expect(response.headers.get("referrer-policy")).toBe("no-referrer");
    expect(response.headers.get("content-security-policy")).toContain("default-src 'none'");
  });

  // RFC 9111 §5.2.2.5: no-store forbids any cache from keeping the response.
  it("marks API answers as not storable", async () => {
    expect((await worker.fetch("/v1/classify", jsonPost({ text: QUESTION }))).headers.get("cache-control")).toBe("no-store");
  });

  it("sends no CORS headers when no origin is allowed", async () => {
    const response = await worker.fetch("/v1/model", { headers: { origin: "https://shop.example" } });
    expect(response.headers.get("access-control-allow-origin")).toBeNull();
  });
});

describe("with API_TOKEN, CORS_ORIGINS and a rate limiter", () => {
  const TOKEN = "s3cret-t0ken.for_tests~1";
  let guarded: RunningWorker;

  beforeAll(async () => {
    guarded = await startWorker(
      { ...VARS, API_TOKEN: TOKEN, CORS_ORIGINS: "https://shop.example, https://admin.shop.example" },
      { ratelimits: { RATE_LIMITER: { simple: { limit: 12, period: 60 } } } },
    );
  });

  afterAll(async () => {
    await guarded?.miniflare.dispose();
  });

  // RFC 6750 §3: a 401 carries WWW-Authenticate with the Bearer scheme.
  it("answers 401 with a Bearer challenge when the token is missing", async () => {
    const response = await guarded.fetch("/v1/model");
    expect(response.headers.get("www-authenticate")).toMatch(/^Bearer /);
    await expectError(response, 401, "unauthorized");
  });

  // RFC 6750 §3.1: error="invalid_token" for a wrong token.
  it("answers 401 invalid_token for a wrong token of the same length", async () => {
    const wrong = TOKEN.slice(0, -1) + "2";
    const response = await guarded.fetch("/v1/model", { headers: { authorization: `Bearer ${wrong}` } });
    expect(response.headers.get("www-authenticate")).toContain('error="invalid_token"');
    await expectError(response, 401, "unauthorized");
  });

  it("answers 401 for a token that is a prefix of the real one", async () => {
    await expectError(await guarded.fetch("/v1/model", { headers: { authorization: `Bearer ${TOKEN.slice(0, 8)}` } }), 401, "unauthorized");
  });

  // RFC 7235 §2.1: the auth scheme name is case-insensitive.
  it("accepts the right token, whatever the case of the scheme", async () => {
    expect((await guarded.fetch("/v1/model", { headers: { authorization: `bearer ${TOKEN}` } })).status).toBe(200);
    expect((await guarded.fetch("/v1/classify", jsonPost({ text: QUESTION }, { authorization: `Bearer ${TOKEN}` }))).status).toBe(200);
  });

  it("keeps the health check and the page open", async () => {
    expect((await guarded.fetch("/healthz")).status).toBe(200);
    expect((await guarded.fetch("/")).status).toBe(200);
  });

  // Fetch standard §3.2.5 (CORS protocol): the allowed origin is echoed; others get no header.
  it("echoes an allowed origin and ignores others", async () => {
    const headers = { authorization: `Bearer ${TOKEN}` };
    const allowed = await guarded.fetch("/v1/model", { headers: { ...headers, origin: "https://admin.shop.example" } });
    expect(allowed.headers.get("access-control-allow-origin")).toBe("https://admin.shop.example");
    const other = await guarded.fetch("/v1/model", { headers: { ...headers, origin: "https://elsewhere.example" } });
    expect(other.headers.get("access-control-allow-origin")).toBeNull();
  });

  it("answers a CORS preflight without a token", async () => {
    const response = await guarded.fetch("/v1/classify", {
      method: "OPTIONS",
      headers: { origin: "https://shop.example", "access-control-request-method": "POST", "access-control-request-headers": "content-type, authorization" },
    });
    expect(response.status).toBe(204);
    expect(response.headers.get("access-control-allow-origin")).toBe("https://shop.example");
    expect(response.headers.get("access-control-allow-headers")?.toLowerCase()).toContain("authorization");
  });

  // RFC 6585 §4: 429 Too Many Requests.
  it("answers 429 once the rate limiter says no", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 16; i++) {
      const response = await guarded.fetch("/v1/model", { headers: { authorization: `Bearer ${TOKEN}`, "cf-connecting-ip": "192.0.2.7" } });
      statuses.push(response.status);
      if (response.status === 429) await expectError(response, 429, "rate-limited");
      else await response.arrayBuffer();
    }
    expect(statuses.slice(0, 12).every((status) => status === 200)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    // Another client (RFC 5737 documentation address) still gets through.
    expect((await guarded.fetch("/v1/model", { headers: { authorization: `Bearer ${TOKEN}`, "cf-connecting-ip": "198.51.100.9" } })).status).toBe(200);
  });
});

describe("with an invalid configuration variable", () => {
  it("answers 500 bad-config without showing the variable's value", async () => {
    const broken = await startWorker({ MAX_TEXTS: "plenty-of-them" });
    try {
      const error = await expectError(await broken.fetch("/healthz"), 500, "bad-config");
      expect(error.message).not.toContain("plenty-of-them");
    } finally {
      await broken.miniflare.dispose();
    }
  });
});
