// One model answers the same question the same way on every surface: the library, the CLI and
// the HTTP app (which `sluice serve` and the Worker both run) share runtime/surface-defaults.ts.
import { readFileSync } from "node:fs";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadModel } from "../../runtime/format/load-model.ts";
import type { Model } from "../../runtime/model/model.ts";
import { SURFACE_DEFAULTS } from "../../runtime/surface-defaults.ts";
import { resolveAppConfig } from "../../runtime/worker/app-config.ts";
import { createApp } from "../../runtime/worker/create-app.ts";
import { sluice } from "./run-sluice.ts";

let directory = "";
let modelPath = "";
let model: Model;
let app: ReturnType<typeof createApp>;
// Invented contact-form texts (demo-data/README.md scenario).
const TEXT = "Hi, I was charged twice for order B20417, can you refund one of the payments?";

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-surfaces-"));
  modelPath = join(directory, "plain.sluice");
  // No policy: the review floor is the shared default, not the model's.
  const build = await sluice(["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--epochs", "3", "--hash-bits", "16", "--search-time", "0", "--out", modelPath, "--quiet", "--force"]);
  if (build.code !== 0) throw new Error(build.stderr);
  model = loadModel(readFileSync(modelPath));
  app = createApp(model, resolveAppConfig());
}, 120_000);

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

const post = async (path: string, body: unknown) => (await app.request(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) })).json() as Promise<Record<string, any>>;

describe("the defaults every surface shares", () => {
  it("should explain the same labels with the same number of features in the CLI, over HTTP and in the library", async () => {
    const cli = JSON.parse((await sluice(["explain", modelPath, TEXT, "--json"])).stdout);
    const http = await post("/v1/explain", { text: TEXT });
    const library = model.explain(TEXT);
    expect(library.labels).toHaveLength(SURFACE_DEFAULTS.explainTop);
    expect(library.labels[0].features).toHaveLength(SURFACE_DEFAULTS.explainFeatures);
    for (const answer of [cli, http]) {
      expect(answer.labels.map((l: { label: string }) => l.label)).toEqual(library.labels.map((l) => l.label));
      expect(answer.labels[0].features).toHaveLength(library.labels[0].features.length);
    }
  });

  it("should list the same labels from classify in the CLI, over HTTP and in the library", async () => {
    const cli = JSON.parse((await sluice(["classify", modelPath, "-", "--json"], { input: `${TEXT}\n` })).stdout);
    const http = await post("/v1/classify", { text: TEXT });
    const library = JSON.parse(JSON.stringify(model.classify(TEXT)));
    expect(http.labels).toEqual(library);
    expect(cli.labels.map((l: { label: string }) => l.label)).toEqual(library.map((l: { label: string }) => l.label));
  });

  it("should give a model without a policy the same decision in the CLI as /v1/moderate gives", async () => {
    // The demo samples, and a bare greeting, which this model finds hard to place.
    const texts = [...readFileSync("demo-data/samples.txt", "utf8").split("\n").filter((line) => line.trim() !== ""), "hello"];
    const textsPath = join(directory, "texts.txt");
    await writeFile(textsPath, `${texts.join("\n")}\n`);
    const cli = (await sluice(["classify", modelPath, textsPath, "--json"])).stdout.trim().split("\n").map((line) => JSON.parse(line));
    for (let i = 0; i < texts.length; i++) {
      const http = await post("/v1/moderate", { text: texts[i] });
      expect(cli[i].decision.action, texts[i]).toBe(http.decision?.action ?? http.action);
    }
    // The floor is what makes them agree: some sample falls under it.
    expect(cli.some((line: { decision: { action: string } }) => line.decision.action === "review")).toBe(true);
  });
});
