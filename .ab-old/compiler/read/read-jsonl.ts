// JSONL records to examples: one JSON object per physical line, read with node:readline
// so only one line is in memory at a time. Blank (whitespace-only) lines are ignored but
// still counted, so line numbers are those an editor shows.

import { createInterface } from "node:readline";
import type { Readable } from "node:stream";
import { DataError } from "./data-error.ts";
import { finishRow, rejectBadRow } from "./finish-row.ts";
import { describeJsonType, isJsonObject, readJsonGroup, readJsonLabels, readJsonTextParts } from "./json-fields.ts";
import type { ReadContext } from "./read-context.ts";
import type { Example } from "./read-types.ts";

const BYTE_ORDER_MARK = "\uFEFF";

// A whole-file JSON array (a common mix-up with .json files) fails on its first line;
// saying so beats a bare parser message.
const ARRAY_HINT = "; the file looks like one JSON array, but each line must hold one JSON object";

/**
 * Examples from a JSONL byte stream, yielded one by one.
 * @example for await (const example of readJsonl(createReadStream("data.jsonl"), context)) {}
 */
export async function* readJsonl(source: Readable, context: ReadContext): AsyncGenerator<Example> {
  const { file, report } = context;
  // crlfDelay: Infinity makes CRLF one line break even when CR and LF land in different chunks.
  const lines = createInterface({ input: source, crlfDelay: Infinity });
  let line = 0;
  let firstRecord = true;
  try {
    for await (const rawLine of lines) {
      line++;
      const text = line === 1 && rawLine.startsWith(BYTE_ORDER_MARK) ? rawLine.slice(1) : rawLine;
      if (text.trim() === "") continue;
      report.rows++;
      const hint = firstRecord && text.trimStart().startsWith("[") ? ARRAY_HINT : "";
      firstRecord = false;
      let value: unknown;
      try {
        value = JSON.parse(text);
      } catch (error) {
        const reason = error instanceof Error ? error.message : String(error);
        rejectBadRow(context, new DataError("bad-json", { file, line }, `invalid JSON (${reason})${hint}`));
        continue;
      }
      if (!isJsonObject(value)) {
        const detail = `expected a JSON object, found ${describeJsonType(value)}${hint}`;
        rejectBadRow(context, new DataError("not-object", { file, line }, detail));
        continue;
      }
      let textParts: string[];
      let labels: string[] | null;
      let group: string | undefined;
      try {
        textParts = readJsonTextParts(value, context, line);
        labels = readJsonLabels(value, context, line);
        group = readJsonGroup(value, context, line);
      } catch (error) {
        if (!(error instanceof DataError)) throw error;
        rejectBadRow(context, error);
        continue;
      }
      const example = finishRow(context, line, textParts, labels, group);
      if (example !== null) yield example;
    }
  } finally {
    // Closing readline leaves its input open; destroying the source closes the file.
    lines.close();
    source.destroy();
  }
}
