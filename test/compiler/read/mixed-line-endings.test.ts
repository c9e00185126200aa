// A CRLF export with LF rows appended (or the reverse) is read row by row with physical line
// numbers, and a bad record that runs over several lines is counted with every line it took.
// RFC 4180 §2 item 1 ends records with CRLF; a bare LF ending is common practice (no source).
import { describe, expect, it } from "vitest";
import { DataError } from "../../../compiler/read/index.ts";
import { readAllFromText, readError } from "./read-all.ts";

describe("CSV with mixed line endings", () => {
  it("should read LF rows appended to a CRLF file as rows, with their physical lines", async () => {
    const crlf = ["label,text,id", "billing,charged twice,1", "shipping,parcel late,2"].join("\r\n");
    const lf = ["returns,wrong size,3", "billing,refund please,4", "shipping,lost box,5"].join("\n");
    const { examples, report } = await readAllFromText("mixed.csv", `${crlf}\r\n${lf}\n`);
    expect(examples.map((e) => [e.line, e.text])).toEqual([
      [2, "charged twice"],
      [3, "parcel late"],
      [4, "wrong size"],
      [5, "refund please"],
      [6, "lost box"],
    ]);
    expect(report.skipped).toBe(0);
  });

  it("should read CRLF rows appended to an LF file without a stray carriage return", async () => {
    const { examples } = await readAllFromText("mixed.csv", "label,text\nbilling,charged twice\r\nshipping,parcel late\r\n");
    expect(examples.map((e) => [e.line, e.text, e.labels[0]])).toEqual([
      [2, "charged twice", "billing"],
      [3, "parcel late", "shipping"],
    ]);
  });

  it("should name every physical line of a bad record that spans several, and count them as lost", async () => {
    // A quote opened on line 3 closes on line 5, gluing lines 3-5 into one record of 4 fields.
    const data = ["label,text,id", "billing,charged twice,1", 'shipping,"parcel late,2', "returns,wrong size,3", 'billing,refund",4,x', "shipping,lost box,5"].join("\n");
    const error = await readError("broken.csv", data);
    expect(error).toBeInstanceOf(DataError);
    expect((error as DataError).message).toMatch(/broken\.csv line 3: .*runs over lines 3–5/);
    const { examples, report } = await readAllFromText("broken.csv", data, { skipBad: true });
    expect(examples.map((e) => e.line)).toEqual([2, 6]);
    expect(report.skipped).toBe(1);
    expect(report.skippedLines).toBe(3);
  });
});
