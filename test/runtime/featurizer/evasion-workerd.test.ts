// Folding gives identical features in Node and in workerd (the Workers runtime, through
// programmatic Miniflare): the featurizer bundled by esbuild as a Worker featurizes evasive
// texts and returns their slots and names; Node featurizes the same texts from the sources.
// Both use their engine's own String.prototype.normalize, toLowerCase and Unicode regexes.
import { build } from "esbuild";
import { Log, LogLevel, Miniflare } from "miniflare";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, type FeaturizerSettings } from "../../../runtime/index.ts";
import { COMPATIBILITY_DATE } from "../../worker/helpers/worker-fixture.ts";

const SETTINGS: FeaturizerSettings = { normalization: 3, wordSpan: 2, charMin: 3, charMax: 4, hashBits: 20, hashSeed: 11, maxTokens: 2000 };
const TEXTS = [
  "frее mоney now", "FRЕЕ МОNЕY", "fr33 m0ney n0w h4x0r", "f r e e money", "f.r.e.e m-o-n-e-y", "freeeeee mooooney",
  "fr\u200Bee mo\u200Dney", "cl\u00ADick h\u2060ere fr\u202Eee", "fr*ee mo_ney", "$ex ca$h h@ck sh!t fr€€", "ꓑayPal 𐐽ash Ƽale",
  "$4.99 14th 10am mp3 covid19 abc123 h2o", "mail b0b@example.com or https://fr33.example.com", "Привет мир και Tシャツ",
  "ＦＲＥＥ ﬁle Σ ΑΣ İstanbul", "a\u00AD\u0301 ꓑ\u0301 \ud800 \udc00", "\u0645\u06cc\u200c\u062e\u0648\u0627\u0647\u0645 👨‍👩‍👧",
];

const WORKER = `
import { createFeatureBuffer, createFeaturizer } from "./runtime/index.ts";
export default {
  async fetch(request) {
    const { settings, texts } = await request.json();
    const featurizer = createFeaturizer(settings);
    const buffer = createFeatureBuffer(16, true);
    const out = texts.map((text) => {
      featurizer.featurize(text, buffer);
      return { slots: Array.from(buffer.slots.subarray(0, buffer.count)), names: buffer.names.slice(), sources: buffer.sources.slice() };
    });
    return Response.json(out);
  },
};`;

let miniflare: Miniflare;

beforeAll(async () => {
  const bundled = await build({
    stdin: { contents: WORKER, resolveDir: new URL("../../../", import.meta.url).pathname, sourcefile: "featurize-worker.js", loader: "js" },
    bundle: true,
    format: "esm",
    platform: "browser",
    conditions: ["workerd", "worker", "browser"],
    write: false,
    logLevel: "silent",
  });
  miniflare = new Miniflare({ modules: true, script: bundled.outputFiles[0].text, compatibilityDate: COMPATIBILITY_DATE, log: new Log(LogLevel.WARN) });
  await miniflare.ready;
}, 60_000);

afterAll(async () => {
  await miniflare?.dispose();
});

describe("evasion folding in workerd", () => {
  it("gives the features Node gives, names and original spans included", async () => {
    const response = await miniflare.dispatchFetch("http://featurize.test/", { method: "POST", body: JSON.stringify({ settings: SETTINGS, texts: TEXTS }) });
    const fromWorkerd = await response.json();
    const featurizer = createFeaturizer(SETTINGS);
    const buffer = createFeatureBuffer(16, true);
    const fromNode = TEXTS.map((text) => {
      featurizer.featurize(text, buffer);
      return { slots: Array.from(buffer.slots.subarray(0, buffer.count)), names: [...(buffer.names as string[])], sources: [...(buffer.sources as (string | null)[])] };
    });
    expect(fromWorkerd).toEqual(fromNode);
    // Not vacuous: folding happened on both sides.
    expect(fromNode[0].names).toContain("[mixed-script]");
    expect(fromNode[2].names).toContain("money");
  });
});
