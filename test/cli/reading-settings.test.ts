// The settings that say how data is read travel with it: `tune` writes them into its config,
// so the build command it prints reads the data the same way, and a model records its label
// separator, so eval, report, compare and classify split multi-label cells as the build did.
// The data is an invented inbox (fictional customers), written as CSV with labels in one cell.

import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sluice } from "./run-sluice.ts";

const PHRASES: Record<string, string[]> = {
  billing: ["I was charged twice", "the invoice is wrong", "refund the duplicate payment", "my card was billed again"],
  shipping: ["the parcel has not arrived", "tracking says delivered", "the courier lost the box", "the delivery is late"],
  urgent: ["please answer today", "this is urgent", "fix this immediately", "I need this now"],
};

let directory = "";
let data = "";

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-reading-"));
  const rows = ["reference,subject,body,tags"];
  let n = 0;
  for (const labels of [["billing"], ["shipping"], ["billing", "urgent"], ["shipping", "urgent"]]) {
    for (let i = 0; i < 4; i++) for (let j = 0; j < 6; j++) {
      n++;
      rows.push(`R${n},Order ${i}${j},"Hello, ${labels.map((l, k) => PHRASES[l][(i + k * j) % 4]).join(" and ")}. Customer ${i}${j}",${labels.join("|")}`);
    }
  }
  data = join(directory, "inbox.csv");
  await writeFile(data, `${rows.join("\n")}\n`);
});

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

describe("a multi-label model", () => {
  it("should remember its label separator, so eval, classify, compare and report split cells as the build did", async () => {
    const model = join(directory, "inbox.sluice");
    const build = await sluice(["build", data, "--text-field", "subject,body", "--label-field", "tags", "--label-sep", "|", "--head", "sigmoid", "--min-docs", "1", "--epochs", "20", "--hash-bits", "14", "--no-fingerprint", "--out", model, "--quiet", "--force"]);
    expect(build.code, build.stderr).toBe(0);
    const inspect = JSON.parse((await sluice(["inspect", model, "--json"])).stdout);
    expect(inspect.provenance.fields).toEqual({ text: ["subject", "body"], label: "tags", labelSep: "|" });
    const evaluation = await sluice(["eval", model, data, "--json"]);
    expect(evaluation.code, evaluation.stderr).toBe(0);
    expect(evaluation.stderr).not.toMatch(/labels the model does not know/);
    expect(JSON.parse(evaluation.stdout).labels.urgent.support).toBe(48);
    const compare = await sluice(["compare", model, model, data]);
    expect(compare.code, compare.stderr).toBe(0);
    expect(compare.stderr).not.toMatch(/labels the models do not know/);
    const report = await sluice(["report", model, data, "--out", join(directory, "report.html"), "--force"]);
    expect(report.code, report.stderr).toBe(0);
    expect(report.stderr).not.toMatch(/labels the model does not know/);
  }, 120_000);
});

describe("sluice tune", () => {
  it("should write a config whose printed build command reads the data as tune did", async () => {
    const config = join(directory, "sluice.config.json");
    const tune = await sluice(["tune", data, "--text-field", "subject,body", "--label-field", "tags", "--label-sep", "|", "--trials", "2", "--time", "60s", "--out", config, "--quiet", "--force"]);
    expect(tune.code, tune.stderr).toBe(0);
    const written = JSON.parse(await readFile(config, "utf8"));
    expect(written.read).toEqual({ textFields: ["subject", "body"], labelField: "tags", labelSep: "|" });
    const printed = /build with: sluice (build .*)$/m.exec(tune.stdout);
    expect(printed, tune.stdout).not.toBeNull();
    const args = (printed as RegExpExecArray)[1].split(" ");
    const built = await sluice([...args, "--out", join(directory, "tuned.sluice"), "--quiet", "--force"]);
    expect(built.code, built.stderr).toBe(0);
    const inspect = JSON.parse((await sluice(["inspect", join(directory, "tuned.sluice"), "--json"])).stdout);
    expect(inspect.labels).toEqual(["billing", "shipping", "urgent"]);
  }, 180_000);

  it("should refuse a config's read setting that is not a known one, naming it", async () => {
    const config = join(directory, "bad.config.json");
    await writeFile(config, JSON.stringify({ read: { textField: ["body"] }, build: {} }));
    const run = await sluice(["build", data, "--config", config, "--out", join(directory, "never.sluice")]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain('unknown read setting "textField"');
  });
});
