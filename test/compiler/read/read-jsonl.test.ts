import { describe, expect, it } from "vitest";
import { DataError } from "../../../compiler/read/index.ts";
import { readAllFromText, readError } from "./read-all.ts";

// JSON Lines (jsonlines.org, from memory): UTF-8, one JSON value per line, lines end with
// "\n" ("\r\n" also works because JSON ignores surrounding white space).

/** What the JavaScript engine's own JSON.parse says about `text` (ECMA-262 JSON.parse). */
function jsonParseMessage(text: string): string {
  try {
    JSON.parse(text);
  } catch (error) {
    return (error as Error).message;
  }
  throw new Error("expected invalid JSON");
}

describe("reading JSONL", () => {
  it("reads an array label as several labels", async () => {
    const data = '{"text":"refund for a broken kettle","label":["billing","damage"]}\n';
    const { examples } = await readAllFromText("tickets.jsonl", data);
    expect(examples).toEqual([{ text: "refund for a broken kettle", labels: ["billing", "damage"], line: 1 }]);
  });

  it("writes number texts and labels the way JSON wrote them", async () => {
    const data = '{"text":42,"label":7}\n{"text":"x","label":[1.5,"two"]}\n';
    const { examples } = await readAllFromText("numbers.jsonl", data);
    expect(examples.map((example) => [example.text, example.labels])).toEqual([
      ["42", ["7"]],
      ["x", ["1.5", "two"]],
    ]);
  });

  it("splits a label string on the label separator", async () => {
    const { examples } = await readAllFromText("sep.jsonl", '{"text":"x","label":"a; b;"}\n', { labelSep: ";" });
    expect(examples[0].labels).toEqual(["a", "b"]);
  });

  it("ignores blank lines but numbers records by physical line", async () => {
    const data = '\n{"text":"a","label":"x"}\r\n   \r\n{"text":"b","label":"y"}';
    const { examples, report } = await readAllFromText("lines.jsonl", data);
    expect(examples.map((example) => example.line)).toEqual([2, 4]);
    expect(report.rows).toBe(2);
  });

  it("reports a bad JSON line with file, line and the parser's message", async () => {
    const badLine = '{"text": "unterminated, "label": "x"';
    const data = `{"text":"ok","label":"x"}\n\n${badLine}\n`;
    const error = (await readError("shop.jsonl", data)) as DataError;
    expect(error).toBeInstanceOf(DataError);
    expect(error.code).toBe("bad-json");
    expect(error.file).toBe("shop.jsonl");
    expect(error.line).toBe(3);
    expect(error.message).toBe(`shop.jsonl line 3: invalid JSON (${jsonParseMessage(badLine)})`);
  });

  it("refuses a JSON value that is not an object", async () => {
    const error = (await readError("values.jsonl", '"just a string"\n')) as DataError;
    expect(error.code).toBe("not-object");
    expect(error.message).toBe("values.jsonl line 1: expected a JSON object, found a string");
  });

  it("says when a file holds one JSON array instead of one object per line", async () => {
    const error = (await readError("export.json", '[\n{"text":"a","label":"x"}\n]\n')) as DataError;
    expect(error.code).toBe("bad-json");
    expect(error.message).toContain("the file looks like one JSON array");
  });

  it("names the field and the type found when a text field is not a string", async () => {
    const error = (await readError("types.jsonl", '{"text":["a"],"label":"x"}\n')) as DataError;
    expect(error.code).toBe("bad-field-type");
    expect(error.field).toBe("text");
    expect(error.message).toBe('types.jsonl line 1, field "text": expected a string, found an array');
  });

  it("treats a missing text field as a bad row", async () => {
    const error = (await readError("missing.jsonl", '{"body":"a","label":"x"}\n')) as DataError;
    expect(error.code).toBe("missing-field");
    expect(error.message).toBe('missing.jsonl line 1, field "text": missing; expected a string');
  });

  it("does not take a text field from the object prototype", async () => {
    const error = (await readError("proto.jsonl", '{"label":"x"}\n', { textFields: ["constructor"] })) as DataError;
    expect(error.code).toBe("missing-field");
  });

  it("refuses a label of the wrong type, naming the array item", async () => {
    const objectLabel = (await readError("labels.jsonl", '{"text":"a","label":{"name":"x"}}\n')) as DataError;
    expect(objectLabel.code).toBe("bad-field-type");
    expect(objectLabel.message).toBe(
      'labels.jsonl line 1, field "label": expected a string, a number or an array of strings, found an object',
    );
    const badItem = (await readError("labels.jsonl", '{"text":"a","label":["x",true]}\n')) as DataError;
    expect(badItem.message).toBe('labels.jsonl line 1, field "label": item 2 of the array is a boolean, expected a string');
  });

  it("counts each kind of bad row with skipBad and keeps reading", async () => {
    const data = [
      '{"text":"good one","label":"x"}',
      "{broken",
      "[1,2]",
      '{"text":true,"label":"x"}',
      '{"label":"x"}',
      "{also broken",
      '{"text":"good two","label":"y"}',
    ].join("\n");
    const { examples, report } = await readAllFromText("mixed.jsonl", data, { skipBad: true });
    expect(examples.map((example) => example.text)).toEqual(["good one", "good two"]);
    expect(report.rows).toBe(7);
    expect(report.skipped).toBe(5);
    expect(report.skippedByReason).toEqual({ "bad-json": 2, "not-object": 1, "bad-field-type": 1, "missing-field": 1 });
    expect(report.samples.map((sample) => sample.slice(0, sample.indexOf(":")))).toEqual([
      "mixed.jsonl line 2",
      "mixed.jsonl line 3",
      'mixed.jsonl line 4, field "text"',
      'mixed.jsonl line 5, field "text"',
      "mixed.jsonl line 6",
    ]);
  });

  it("counts empty texts and missing or empty labels without yielding them", async () => {
    const data = [
      '{"text":"kept","label":"x"}',
      '{"text":"   ","label":"x"}',
      '{"text":"no label"}',
      '{"text":"null label","label":null}',
      '{"text":"empty label","label":""}',
      '{"text":"empty array","label":[]}',
    ].join("\n");
    const { examples, report } = await readAllFromText("gaps.jsonl", data);
    expect(examples.map((example) => example.text)).toEqual(["kept"]);
    expect(report.emptyText).toBe(1);
    expect(report.missingLabel).toBe(4);
    expect(report.samples).toEqual([
      'gaps.jsonl line 2: text is empty (field "text")',
      'gaps.jsonl line 3: field "label" is missing',
      'gaps.jsonl line 4: field "label" is missing',
      'gaps.jsonl line 5: field "label" is empty',
      'gaps.jsonl line 6: field "label" is empty',
    ]);
  });

  it("gives examples without labels when labels are not required", async () => {
    const data = '{"text":"a"}\n{"text":"b","label":"x"}\n';
    const { examples, report } = await readAllFromText("free.jsonl", data, { requireLabels: false });
    expect(examples.map((example) => example.labels)).toEqual([[], ["x"]]);
    expect(report.missingLabel).toBe(0);
  });
});
