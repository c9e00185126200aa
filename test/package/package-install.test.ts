// The package as a user gets it: `npm pack` (prepack compiles to lib/), the tarball installed
// into an empty folder without the network, then plain Node (no TypeScript loader) builds a
// model with the installed CLI, classifies with `sluice/runtime`, and the same entry runs in
// a browser (esbuild bundle in Debian's chromium). The compiled code must behave exactly like
// the sources: the scores are compared with the repository's runtime on the same bytes.

import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { build as esbuild } from "esbuild";
import { chromium } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadModel } from "../../runtime/index.ts";
import { installOffline, run } from "./offline-install.ts";

const REPO = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const CHROMIUM = "/usr/bin/chromium";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];
/** Ceilings of what the tarball ships (measured 306 files, 237 KB when this test was written). */
// Ceilings that catch shipping test/, scripts/ or data by mistake (those made the old tarball
// 777 KB); each compiled module ships as .js + .d.ts, so the count grows with the code.
const MAX_FILES = 450;
const MAX_TARBALL_BYTES = 400 * 1024;
const TEXTS = ["Buy cheap watches now, limited offer, click here", "Hello, my order arrived damaged, can you help?", "", "ünïcödé and emoji 🎉 in one text"];

interface PackResult {
  filename: string;
  size: number;
  entryCount: number;
  files: { path: string }[];
}

let folder: string;
let pack: PackResult;

/** Plain Node: no loader flags inherited from the test runner. */
function plainNode(args: string[], env: Record<string, string> = {}): string {
  const { NODE_OPTIONS: _, ...rest } = process.env;
  return execFileSync(process.execPath, args, { cwd: folder, encoding: "utf8", env: { ...rest, ...env } });
}

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), "sluice-package-"));
  pack = (JSON.parse(run("npm", ["pack", "--json", "--pack-destination", folder, "--loglevel=error"], REPO)) as PackResult[])[0];
  installOffline(folder, pack.filename, REPO);
  // A small slice of the demo contact form (JSONL, text in "message").
  const lines = readFileSync(join(REPO, "demo-data/contact-form.jsonl"), "utf8").split("\n").slice(0, 400);
  writeFileSync(join(folder, "small.jsonl"), `${lines.join("\n")}\n`);
}, 600_000); // packing compiles the whole tree and the install unpacks every dependency: minutes on a busy machine

afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

describe("the packed tarball", () => {
  it("should ship only the compiled code, its types, the CLI shim and the documents", () => {
    const paths = pack.files.map((f) => f.path);
    for (const required of ["package.json", "README.md", "LICENSE", "runtime/format/FORMAT.md", "bin/sluice.js", "lib/runtime/index.js", "lib/runtime/index.d.ts", "lib/compiler/index.js", "lib/compiler/index.d.ts", "lib/runtime/worker/index.js", "lib/compiler/cli/main.js", "lib/compiler/train/train-worker.js"]) {
      expect(paths, required).toContain(required);
    }
    const unwanted = paths.filter((path) => /^(test|scripts|demo-data|node_modules)\//.test(path) || (path.endsWith(".ts") && !path.endsWith(".d.ts")));
    expect(unwanted).toEqual([]);
  });

  it("should stay under its file-count and size ceilings", () => {
    console.log(`tarball ${pack.filename}: ${pack.entryCount} files, ${pack.size} bytes`);
    expect(pack.entryCount).toBeLessThanOrEqual(MAX_FILES);
    expect(pack.size).toBeLessThanOrEqual(MAX_TARBALL_BYTES);
  });
});

describe("the installed package under plain Node", () => {
  it("should build with the installed CLI, on two training threads, a model the repository's runtime loads", () => {
    plainNode(["node_modules/.bin/sluice", "build", "small.jsonl", "--text-field", "message", "--threads", "2", "--epochs", "2", "--out", "threads.sluice", "--quiet"]);
    const model = loadModel(readFileSync(join(folder, "threads.sluice")));
    expect(model.meta.labels).toEqual(["abusive", "ok", "spam"]);
  });

  it("should build byte for byte the model the sources build (one thread, fixed build time)", () => {
    const settings = ["small.jsonl", "--text-field", "message", "--threads", "1", "--epochs", "2", "--quiet"];
    plainNode(["node_modules/.bin/sluice", "build", ...settings, "--out", "installed.sluice"], { SOURCE_DATE_EPOCH: "0" });
    plainNode([join(REPO, "bin/sluice.js"), "build", ...settings, "--out", "sources.sluice"], { SOURCE_DATE_EPOCH: "0" });
    const installed = readFileSync(join(folder, "installed.sluice"));
    expect(installed.equals(readFileSync(join(folder, "sources.sluice")))).toBe(true);
  });

  it("should classify with sluice/runtime exactly as the repository's runtime does", () => {
    writeFileSync(join(folder, "classify.mjs"), `import { readFileSync } from "node:fs";\nimport { loadModel } from "sluice/runtime";\nconst model = loadModel(readFileSync("installed.sluice"));\nconsole.log(JSON.stringify(${JSON.stringify(TEXTS)}.map((text) => model.classify(text, { top: 3 }))));\n`);
    const installed = JSON.parse(plainNode(["classify.mjs"]));
    const sources = loadModel(readFileSync(join(folder, "installed.sluice")));
    expect(installed).toEqual(TEXTS.map((text) => sources.classify(text, { top: 3 })));
  });

  it("should expose the compiler and the Worker app as named exports", () => {
    writeFileSync(join(folder, "surface.mjs"), `import * as compiler from "sluice/compiler";\nimport * as worker from "sluice/worker";\nconsole.log(JSON.stringify([typeof compiler.build, typeof compiler.buildFromFile, typeof worker.createApp, typeof worker.handleEmail]));\n`);
    expect(JSON.parse(plainNode(["surface.mjs"]))).toEqual(["function", "function", "function", "function"]);
  });

  it("should give a TypeScript user types through the exports' types conditions (moduleResolution nodenext)", () => {
    writeFileSync(join(folder, "typed.ts"), `import { loadModel, type LabelScore } from "sluice/runtime";\nimport { build, type BuildReport } from "sluice/compiler";\nimport { createApp } from "sluice/worker";\nconst scores: LabelScore[] = loadModel(new Uint8Array(0)).classify("text");\nconst label: string = scores[0].label;\nconst report: Promise<BuildReport> = build({ examples: [], settings: {} as never, buildTime: "" }).then((r) => r.report);\nvoid [label, report, createApp];\n// @ts-expect-error classify returns scores, not a number: proves the types are real, not any\nconst wrong: number = loadModel(new Uint8Array(0)).classify("text");\nvoid wrong;\n`);
    writeFileSync(join(folder, "tsconfig.json"), JSON.stringify({ compilerOptions: { module: "nodenext", moduleResolution: "nodenext", target: "ES2022", strict: true, noEmit: true, skipLibCheck: false, lib: ["ES2022", "DOM"], types: ["node"], typeRoots: [join(REPO, "node_modules/@types")] }, files: ["typed.ts"] }));
    run(process.execPath, [join(REPO, "node_modules/typescript/bin/tsc"), "-p", "tsconfig.json"], folder);
  }, 600_000); // type-checks hono's and Node's declarations too (skipLibCheck off): slow on a busy machine
});

describe("the installed runtime in a browser", () => {
  it("should bundle sluice/runtime for the browser and classify in chromium as Node does", async () => {
    if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: install Debian's chromium (scripts/setup.sh --browser) to run the page tests`);
    writeFileSync(join(folder, "browser-entry.mjs"), `import { loadModel } from "sluice/runtime";\nglobalThis.sluiceLoadModel = loadModel;\n`);
    const bundle = await esbuild({ entryPoints: [join(folder, "browser-entry.mjs")], absWorkingDir: folder, bundle: true, platform: "browser", format: "iife", target: "es2022", minify: true, write: false, logLevel: "silent" });
    const script = bundle.outputFiles[0].text;
    const modelBase64 = readFileSync(join(folder, "installed.sluice")).toString("base64");
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
    try {
      const page = await browser.newPage();
      const errors: string[] = [];
      page.on("pageerror", (error) => errors.push(error.message));
      await page.setContent("<!doctype html><title>sluice</title>");
      await page.addScriptTag({ content: script });
      const inBrowser = await page.evaluate(
        ({ base64, texts }) => {
          const bytes = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
          const model = (globalThis as unknown as { sluiceLoadModel: typeof loadModel }).sluiceLoadModel(bytes);
          return texts.map((text) => model.classify(text, { top: 3 }));
        },
        { base64: modelBase64, texts: TEXTS },
      );
      expect(errors).toEqual([]);
      const inNode = loadModel(readFileSync(join(folder, "installed.sluice")));
      expect(inBrowser).toEqual(TEXTS.map((text) => inNode.classify(text, { top: 3 })));
    } finally {
      await browser.close();
    }
  });
});
