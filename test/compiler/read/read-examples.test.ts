import { mkdir, mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  createReadReport,
  DataError,
  readExamples,
  type Example,
  type ReadOptions,
} from "../../../compiler/read/index.ts";
import { collectExamples, readAllFromText, readError } from "./read-all.ts";

const ONE_RECORD = {
  csv: "text,label\nhello,greeting\n",
  tsv: "text\tlabel\nhello\tgreeting\n",
  jsonl: '{"text":"hello","label":"greeting"}\n',
};

describe("choosing the data format", () => {
  it.each([
    ["tickets.csv", ONE_RECORD.csv],
    ["tickets.CSV", ONE_RECORD.csv],
    ["tickets.tsv", ONE_RECORD.tsv],
    ["tickets.tab", ONE_RECORD.tsv],
    ["tickets.jsonl", ONE_RECORD.jsonl],
    ["tickets.ndjson", ONE_RECORD.jsonl],
    ["tickets.json", ONE_RECORD.jsonl],
  ])("reads %s by its extension", async (name, text) => {
    const { examples } = await readAllFromText(name, text);
    expect(examples).toEqual([{ text: "hello", labels: ["greeting"], line: 2 - Number(name.includes("json")) }]);
  });

  it("lets an explicit format override the extension", async () => {
    const { examples } = await readAllFromText("-", ONE_RECORD.tsv, { format: "tsv" });
    expect(examples[0].text).toBe("hello");
  });

  it("refuses an unknown extension, listing the known ones and the --format flag", async () => {
    const error = (await readError("tickets.txt", ONE_RECORD.csv)) as DataError;
    expect(error).toBeInstanceOf(DataError);
    expect(error.code).toBe("unknown-format");
    expect(error.line).toBeNull();
    expect(error.message).toContain('tickets.txt: cannot tell the data format: extension ".txt" is not known');
    expect(error.message).toContain(".csv, .tsv, .tab, .jsonl, .ndjson, .json");
    expect(error.message).toContain("pass --format csv|tsv|jsonl");
  });

  it("refuses a name without an extension when no format is given", async () => {
    const error = (await readError("-", ONE_RECORD.csv)) as DataError;
    expect(error.code).toBe("unknown-format");
    expect(error.message).toContain("the name has no extension");
  });
});

describe("checking read options", () => {
  it.each<[string, ReadOptions]>([
    ["an empty textFields", { textFields: [] }],
    ["an empty labelField", { labelField: "" }],
    ["an empty labelSep", { labelSep: "" }],
  ])("refuses %s", async (_name, options) => {
    const error = (await readError("data.csv", ONE_RECORD.csv, options)) as DataError;
    expect(error.code).toBe("bad-option");
  });
});

describe("the read report", () => {
  it("counts empty texts and missing labels in CSV, so every row lands in one count", async () => {
    const data = [
      "text,label,note",
      "kept,x,1",
      ",x,2",
      '"  ",x,3',
      "no label,,4",
      "blank label, ,5",
      "short row",
    ].join("\n");
    const { examples, report } = await readAllFromText("gaps.csv", data, { skipBad: true });
    expect(examples.map((example) => example.text)).toEqual(["kept"]);
    expect(report).toMatchObject({ rows: 6, examples: 1, emptyText: 2, missingLabel: 2, skipped: 1 });
    expect(report.rows).toBe(report.examples + report.emptyText + report.missingLabel + report.skipped);
    expect(report.samples[3]).toBe('gaps.csv line 6: field "label" is empty');
  });

  it("names all text fields when their joined text is empty", async () => {
    const { report } = await readAllFromText("join.csv", "title,body,label\n,,x\n", { textFields: ["title", "body"] });
    expect(report.samples).toEqual(['join.csv line 2: text is empty (fields "title", "body")']);
  });

  it("keeps at most five sample messages", async () => {
    const rows = Array.from({ length: 8 }, (_unused, index) => `row ${index}`);
    const { report } = await readAllFromText("many.csv", ["text,label", ...rows].join("\n"), { skipBad: true });
    expect(report.skipped).toBe(8);
    expect(report.samples).toHaveLength(5);
    expect(report.samples[4]).toContain("many.csv line 6:");
  });
});

// A data set big enough to span several 64 KiB read chunks, with multi-byte characters and
// quoted line breaks, so chunk boundaries fall inside characters and inside records.
function inventedTickets(count: number): { csv: string; jsonl: string; csvLines: number[] } {
  const csvRows = ["text,label"];
  const jsonRows: string[] = [];
  const csvLines: number[] = [];
  let line = 2;
  for (let index = 0; index < count; index++) {
    const multiLine = index % 7 === 0;
    const text = multiLine
      ? `Ticket ${index} for Quillfeather Teas:\r\ncafé order, "rooibos" ✓ 🫖\nplease call back`
      : `Ticket ${index}: the ørbit kettle hums, then stops — über loud`;
    const label = index % 3 === 0 ? "billing|shipping" : "support";
    csvRows.push(`"${text.replaceAll('"', '""')}",${label}`);
    jsonRows.push(JSON.stringify({ text, label: label.split("|") }));
    csvLines.push(line);
    line += multiLine ? 3 : 1;
  }
  return { csv: csvRows.join("\r\n") + "\r\n", jsonl: jsonRows.join("\n") + "\n", csvLines };
}

describe("reading files from disk", () => {
  let directory = "";
  beforeAll(async () => {
    directory = await mkdtemp(join(tmpdir(), "sluice-read-"));
  });
  afterAll(async () => {
    await rm(directory, { recursive: true, force: true });
  });

  async function readFile(path: string, options: ReadOptions): Promise<Example[]> {
    return collectExamples(readExamples(path, options));
  }

  it("gives the same CSV examples from a file as from the same text in memory", async () => {
    const { csv, csvLines } = inventedTickets(4000);
    expect(Buffer.byteLength(csv)).toBeGreaterThan(4 * 65536);
    const path = join(directory, "tickets.csv");
    await writeFile(path, csv);
    const fromFile = await readFile(path, { labelSep: "|" });
    const fromText = (await readAllFromText(path, csv, { labelSep: "|" })).examples;
    expect(fromFile).toEqual(fromText);
    expect(fromFile.map((example) => example.line)).toEqual(csvLines);
    expect(fromFile[7].text).toBe('Ticket 7 for Quillfeather Teas:\r\ncafé order, "rooibos" ✓ 🫖\nplease call back');
  });

  it("gives the same JSONL examples from a file as from the same text in memory", async () => {
    const { jsonl } = inventedTickets(4000);
    const path = join(directory, "tickets.jsonl");
    await writeFile(path, jsonl);
    const fromFile = await readFile(path, {});
    expect(fromFile).toEqual((await readAllFromText(path, jsonl)).examples);
    expect(fromFile).toHaveLength(4000);
    expect(fromFile[3999]).toMatchObject({ line: 4000, labels: ["billing", "shipping"] });
  });

  it("fills in the report passed to readExamples", async () => {
    const path = join(directory, "report.csv");
    await writeFile(path, "text,label\na,x\n,x\n");
    const report = createReadReport(path);
    await collectExamples(readExamples(path, {}, report));
    expect(report).toMatchObject({ file: path, rows: 2, examples: 1, emptyText: 1 });
  });

  it("stops reading when the consumer stops early", async () => {
    const path = join(directory, "early.jsonl");
    await writeFile(path, inventedTickets(2000).jsonl);
    const report = createReadReport(path);
    for await (const example of readExamples(path, {}, report)) {
      if (example.line === 3) break;
    }
    expect(report.examples).toBe(3);
  });

  it("refuses a file that does not exist", async () => {
    const path = join(directory, "absent.csv");
    const examples = readExamples(path);
    await expect(examples.next()).rejects.toMatchObject({ code: "unreadable", file: path });
  });

  it("refuses a directory", async () => {
    const path = join(directory, "folder.csv");
    await mkdir(path);
    await expect(readExamples(path).next()).rejects.toMatchObject({ code: "unreadable" });
  });

  it("says a path without a known extension is missing or a folder, not that its format is unknown", async () => {
    const absent = join(directory, "absent");
    await expect(readExamples(absent).next()).rejects.toMatchObject({ code: "unreadable", file: absent, message: expect.stringContaining("no such file") });
    const folder = join(directory, "plain-folder");
    await mkdir(folder);
    await expect(readExamples(folder).next()).rejects.toMatchObject({ code: "unreadable", message: expect.stringContaining("is a directory") });
  });
});
