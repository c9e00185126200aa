import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { reportCommand } from "../../../compiler/cli/commands/report-command.ts";
import { UsageError } from "../../../compiler/cli/parse-args.ts";
import { reportExamples } from "./report-test-model.ts";

let directory: string;
let modelPath: string;
let dataPath: string;

beforeAll(async () => {
  directory = mkdtempSync(join(tmpdir(), "sluice-report-"));
  const examples = reportExamples(30);
  const { bytes } = await build({ examples, settings: { ...defaultBuildSettings(), dims: 8, hashBits: 12, charSpan: [0, 0], minDocs: 1, searchTime: 0 }, buildTime: "2026-01-01T00:00:00.000Z" });
  modelPath = join(directory, "model.sluice");
  dataPath = join(directory, "data.jsonl");
  writeFileSync(modelPath, bytes);
  writeFileSync(dataPath, examples.map((e) => JSON.stringify({ text: e.text, label: e.labels[0] })).join("\n") + "\n");
});

afterAll(() => rmSync(directory, { recursive: true, force: true }));

describe("sluice report", () => {
  it("writes one HTML page to --out and leaves no temporary file behind", async () => {
    // A complete HTML document starts with the doctype (WHATWG HTML, "the DOCTYPE").
    const out = join(directory, "first.html");
    expect(await reportCommand([modelPath, dataPath, "--out", out, "--quiet"])).toBe(0);
    const page = readFileSync(out, "utf8");
    expect(page.startsWith("<!doctype html>")).toBe(true);
    expect(page).toContain("</html>");
    // The atomic writer renames a temporary file over the target (common practice, no source).
    expect(readdirSync(directory).filter((name) => name.endsWith(".tmp"))).toEqual([]);
  });

  it("records the data file's name and SHA-256 in the page", async () => {
    // FIPS 180-4 SHA-256, as computed by Node's crypto for the same bytes.
    const { createHash } = await import("node:crypto");
    const sha = createHash("sha256").update(readFileSync(dataPath)).digest("hex");
    const out = join(directory, "sha.html");
    await reportCommand([modelPath, dataPath, "--out", out, "--quiet"]);
    const page = readFileSync(out, "utf8");
    expect(page).toContain(sha);
    expect(page).toContain("data.jsonl");
  });

  it("refuses to replace an existing file without --force, and replaces it with --force", async () => {
    // The project's rule for every output (write-file-atomic.ts): never overwrite silently.
    const out = join(directory, "twice.html");
    writeFileSync(out, "old");
    await expect(reportCommand([modelPath, dataPath, "--out", out, "--quiet"])).rejects.toThrow(/already exists; pass --force/);
    expect(readFileSync(out, "utf8")).toBe("old");
    expect(await reportCommand([modelPath, dataPath, "--out", out, "--quiet", "--force"])).toBe(0);
    expect(readFileSync(out, "utf8").startsWith("<!doctype html>")).toBe(true);
  });

  it("asks for a model and a data file", async () => {
    await expect(reportCommand([modelPath, "--out", join(directory, "x.html")])).rejects.toThrow(UsageError);
    await expect(reportCommand([modelPath])).rejects.toThrow(/report needs a model and a labelled data file/);
  });

  it("names the model file it cannot read", async () => {
    await expect(reportCommand([join(directory, "missing.sluice"), dataPath, "--out", join(directory, "y.html")])).rejects.toThrow(/model file .*missing\.sluice does not exist/);
  });
});
