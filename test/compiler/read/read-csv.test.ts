import { describe, expect, it } from "vitest";
import { createReadReport, DataError, readExamplesFromText } from "../../../compiler/read/index.ts";
import { collectExamples, readAllFromText, readError } from "./read-all.ts";

describe("reading CSV", () => {
  it("gives the texts and starting lines of the RFC 4180 example records", async () => {
    // Records adapted from RFC 4180 section 2, with a header (item 3) naming the fields:
    // item 5: "aaa","bbb","ccc" (enclosing quotes are not part of the field);
    // item 6: "aaa","b CRLF bb","ccc" (a quoted field may hold a line break, and a comma);
    // item 7: "aaa","b""bb","ccc" (a quote inside a quoted field is doubled);
    // item 4: spaces are part of a field; item 2: the last record may lack a line break;
    // item 1: records end with CRLF.
    const data = [
      "label,text,note",
      '"aaa","bbb","ccc"',
      '"aaa","b\r\nbb","ccc"',
      '"aaa","b,bb","ccc"',
      '"aaa","b""bb","ccc"',
      "zzz, yyy ,xxx",
    ].join("\r\n");
    const { examples } = await readAllFromText("rfc.csv", data);
    expect(examples).toEqual([
      { text: "bbb", labels: ["aaa"], line: 2 },
      { text: "b\r\nbb", labels: ["aaa"], line: 3 },
      { text: "b,bb", labels: ["aaa"], line: 5 },
      { text: 'b"bb', labels: ["aaa"], line: 6 },
      { text: " yyy ", labels: ["zzz"], line: 7 },
    ]);
  });

  it("counts a quoted line break as one line with LF line ends too", async () => {
    // Common practice, no source: many tools write CSV with LF only.
    const data = 'text,label\n"first\nsecond\nthird",a\nplain,b\n';
    const { examples } = await readAllFromText("lf.csv", data);
    expect(examples.map((example) => example.line)).toEqual([2, 5]);
    expect(examples[0].text).toBe("first\nsecond\nthird");
  });

  it("skips blank lines but keeps counting them", async () => {
    const data = "text,label\n\nhello,a\n\n\nworld,b\n\n";
    const { examples, report } = await readAllFromText("blank.csv", data);
    expect(examples.map((example) => [example.text, example.line])).toEqual([
      ["hello", 3],
      ["world", 6],
    ]);
    expect(report.rows).toBe(2);
  });

  it("tolerates a byte order mark before the header", async () => {
    // U+FEFF at the start of a UTF-8 file is a byte order mark (Unicode Standard, ch. 23.8).
    const { examples } = await readAllFromText("bom.csv", "\uFEFFtext,label\nhi,greeting\n");
    expect(examples).toEqual([{ text: "hi", labels: ["greeting"], line: 2 }]);
  });

  it("joins several text fields with a line break in the requested order", async () => {
    const data = "body,label,title\nthe parcel came late,shipping,Late parcel\n";
    const { examples } = await readAllFromText("join.csv", data, { textFields: ["title", "body"] });
    expect(examples[0].text).toBe("Late parcel\nthe parcel came late");
  });

  it("splits a label cell on the label separator, trimming and dropping empty pieces", async () => {
    const data = 'text,label\nrefund for a damaged order,"billing | damage||"\none,billing\n';
    const { examples } = await readAllFromText("multi.csv", data, { labelSep: "|" });
    expect(examples.map((example) => example.labels)).toEqual([["billing", "damage"], ["billing"]]);
  });

  it("keeps a label cell whole without a label separator", async () => {
    const { examples } = await readAllFromText("whole.csv", "text,label\nx,a|b\n");
    expect(examples[0].labels).toEqual(["a|b"]);
  });

  it("throws on a row with the wrong number of fields, naming file, line and counts", async () => {
    // RFC 4180 section 2 item 4: each line should contain the same number of fields.
    const error = await readError("shop.csv", "text,label,note\na,b,c\nonly two,b\n");
    expect(error).toBeInstanceOf(DataError);
    const dataError = error as DataError;
    expect(dataError.code).toBe("column-count");
    expect(dataError.line).toBe(3);
    expect(dataError.message).toBe("shop.csv line 3: expected 3 fields (as in the header on line 1), found 2");
  });

  it("stops on a header without a requested column even when skipping bad rows", async () => {
    const error = await readError("shop.csv", "message,category\nhello,greeting\n", { skipBad: true });
    expect(error).toBeInstanceOf(DataError);
    const dataError = error as DataError;
    expect(dataError.code).toBe("missing-column");
    expect(dataError.field).toBe("text");
    expect(dataError.message).toContain('shop.csv line 1, field "text"');
    expect(dataError.message).toContain('columns found: "message", "category"');
  });

  it("does not need a label column when labels are not required", async () => {
    const { examples } = await readAllFromText("unlabelled.csv", "text\nhello\n", { requireLabels: false });
    expect(examples).toEqual([{ text: "hello", labels: [], line: 2 }]);
  });

  it("stops on a header that names a requested column twice", async () => {
    const error = (await readError("twice.csv", "text,label,text\na,b,c\n")) as DataError;
    expect(error.code).toBe("duplicate-column");
    expect(error.field).toBe("text");
  });

  it("stops on an empty file, saying which header it expected", async () => {
    const error = (await readError("empty.csv", "")) as DataError;
    expect(error.code).toBe("missing-column");
    expect(error.message).toBe('empty.csv: the file is empty; expected a header row naming "text", "label"');
  });

  it("counts and skips wrong-length rows with skipBad", async () => {
    const data = "text,label\na,x\nb\nc,x,extra\nd,x\n";
    const { examples, report } = await readAllFromText("skip.csv", data, { skipBad: true });
    expect(examples.map((example) => example.text)).toEqual(["a", "d"]);
    expect(report.skipped).toBe(2);
    expect(report.skippedByReason).toEqual({ "column-count": 2 });
    expect(report.samples).toEqual([
      "skip.csv line 3: expected 2 fields (as in the header on line 1), found 1",
      "skip.csv line 4: expected 2 fields (as in the header on line 1), found 3",
    ]);
  });

  it("stops on a quote inside an unquoted field, at the line where the record starts", async () => {
    // RFC 4180 section 2 item 5: if a field is not enclosed in quotes, quotes may not appear in it.
    const error = (await readError("quote.csv", 'text,label\nfine,a\nthe 5" screen,b\n', { skipBad: true })) as DataError;
    expect(error.code).toBe("bad-quote");
    expect(error.line).toBe(3);
    expect(error.message).toMatch(/^quote\.csv line 3: /);
  });

  it("reports an earlier bad row before a later broken quote", async () => {
    const error = (await readError("order.csv", 'text,label\nx,y,z\n"a"b,c\n')) as DataError;
    expect(error.code).toBe("column-count");
    expect(error.line).toBe(2);
  });

  it("handles no record after a broken quote, since its boundaries are unknown", async () => {
    const report = createReadReport("after.csv");
    // csv-parse, told to skip the broken record, would go on to emit "later" and "more".
    const data = 'text,label\nfine,a\nthe 5" screen,b\nlater,c\nmore,d\n';
    const reading = collectExamples(readExamplesFromText("after.csv", data, { skipBad: true }, report));
    await expect(reading).rejects.toMatchObject({ code: "bad-quote", line: 3 });
    expect(report).toMatchObject({ rows: 1, examples: 1, skipped: 0 });
  });

  it("stops on a quoted field that is never closed", async () => {
    const error = (await readError("open.csv", 'text,label\nok,a\n"never closed,b\nmore,c\n')) as DataError;
    expect(error.code).toBe("bad-quote");
    expect(error.line).toBe(3);
  });
});

describe("reading TSV", () => {
  it("treats quotes as ordinary characters, as text/tab-separated-values has no quoting", async () => {
    // IANA media type registration text/tab-separated-values (from memory): fields are
    // separated by tabs, and no field may contain a tab; it defines no quoting.
    const data = 'text\tlabel\nthe 5" screen\tdisplay\n"quoted" words\tother\n';
    const { examples } = await readAllFromText("data.tsv", data);
    expect(examples).toEqual([
      { text: 'the 5" screen', labels: ["display"], line: 2 },
      { text: '"quoted" words', labels: ["other"], line: 3 },
    ]);
  });

  it("finds a wrong field count by tabs, not commas", async () => {
    const error = (await readError("data.tsv", "text\tlabel\na, b, c\tx\textra\n")) as DataError;
    expect(error.code).toBe("column-count");
    expect(error.message).toBe("data.tsv line 2: expected 2 fields (as in the header on line 1), found 3");
  });
});
