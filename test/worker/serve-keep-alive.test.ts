// `sluice serve` and fail-closed edges over real sockets: a keep-alive connection keeps
// working after a request refused for its Content-Length before its body was read, spam plus
// one 127k-character word is still decided (not a 500), and a set-but-blank API_TOKEN stops
// the server from starting instead of leaving the API open.
import { spawnSync } from "node:child_process";
import { request, Agent } from "node:http";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ensureDemoModel } from "../../scripts/demo-model.ts";
import { startServe, type ServeProcess } from "./helpers/serve-process.ts";

const CLI = fileURLToPath(new URL("../../bin/sluice.js", import.meta.url));

let server: ServeProcess;
beforeAll(async () => {
  server = await startServe(ensureDemoModel());
});
afterAll(async () => {
  await server?.stop();
});

interface Answer {
  status: number;
  body: string;
  socket: unknown;
  connection: string | undefined;
}

/** One request through `agent`; resolves with the status, body and the socket it used. */
function send(agent: Agent, method: string, path: string, body?: Buffer, headers: Record<string, string | number> = {}): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = request(`${server.url}${path}`, { method, agent, headers }, (res) => {
      let text = "";
      res.setEncoding("utf8").on("data", (chunk: string) => (text += chunk));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body: text, socket: req.socket, connection: res.headers.connection }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

describe("sluice serve with a keep-alive client", () => {
  it("should answer the next request on the connection after an early 413", async () => {
    // One socket, reused (Node's http.Agent with keepAlive: true, maxSockets: 1; RFC 9112 §9.3 persistence).
    const agent = new Agent({ keepAlive: true, maxSockets: 1 });
    try {
      const first = await send(agent, "GET", "/healthz");
      expect(first.status).toBe(200);
      const big = Buffer.alloc(1024 * 1024, 0x61); // 8x the default 128 KiB limit
      const refused = await send(agent, "POST", "/v1/classify", big, { "content-type": "application/json", "content-length": big.length });
      expect(refused.status).toBe(413);
      expect(JSON.parse(refused.body).error.code).toBe("body-too-large");
      // The unread body stays in the socket, so the server says it closes it (RFC 9112 §9.6).
      expect(refused.connection).toBe("close");
      for (let i = 0; i < 3; i++) {
        const next = await send(agent, "POST", "/v1/classify", Buffer.from('{"text":"where is my parcel?"}'), { "content-type": "application/json" });
        expect(next.status).toBe(200);
        expect(JSON.parse(next.body).labels.length).toBeGreaterThan(0);
      }
    } finally {
      agent.destroy();
    }
  });
});

describe("sluice serve with one long word", () => {
  it("should not let one 127k-character word turn a block into a 500 at the default body limit", async () => {
    // The probe's case: spam that is blocked, plus one word just under the 128 KiB limit.
    const agent = new Agent({ keepAlive: false });
    try {
      const spam = "WIN A FREE PRIZE!!! Click www.example.net/win to claim your reward now";
      const body = (text: string) => Buffer.from(JSON.stringify({ text }));
      const plain = await send(agent, "POST", "/v1/moderate", body(spam), { "content-type": "application/json" });
      expect(JSON.parse(plain.body).action).not.toBe("allow");
      const long = await send(agent, "POST", "/v1/moderate", body(`${spam} ${"x".repeat(127 * 1024)}`), { "content-type": "application/json" });
      expect(long.status).toBe(200);
      const decision = JSON.parse(long.body);
      expect(decision.fault).toBeUndefined();
      expect(decision.action).not.toBe("allow");
    } finally {
      agent.destroy();
    }
  });
});

describe("sluice serve with a blank API_TOKEN", () => {
  it.each([["empty", ""], ["spaces", "   "]])("should refuse to start when API_TOKEN is %s", (_name, token) => {
    const run = spawnSync(process.execPath, [CLI, "serve", ensureDemoModel(), "--port", "0"], { encoding: "utf8", timeout: 60_000, env: { ...process.env, API_TOKEN: token } });
    expect(run.status).toBe(1);
    expect(run.stderr).toContain("API_TOKEN: it is set but blank");
  });
});
