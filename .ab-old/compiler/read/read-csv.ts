// CSV and TSV records to examples, streamed through csv-parse.
//
// CSV follows RFC 4180: fields containing commas, quotes or line breaks are quoted and
// inner quotes are doubled. TSV is read the IANA text/tab-separated-values way: fields
// are separated by tabs, there is no quoting and no escaping, so a `"` is an ordinary
// character (common in free text such as `5" screen`), and a field cannot hold a tab or a
// line break.
//
// Line numbers are counted here rather than taken from csv-parse's `info.lines`, which
// over-counts a CRLF inside a quoted field (it counts CR and LF as two lines). Blank lines
// reach `on_record` (skip_empty_lines: false) so every physical line is accounted for, and
// the count runs inside the parser, so it is exact even when a parse error stops it.

import type { Readable } from "node:stream";
import { type CsvError, parse, type Options as CsvParseOptions } from "csv-parse";
import { DataError } from "./data-error.ts";
import { finishRow, rejectBadRow } from "./finish-row.ts";
import type { ReadContext } from "./read-context.ts";
import type { Example } from "./read-types.ts";
import { splitLabelCell } from "./split-labels.ts";

/** One parsed record with the 1-based physical lines it starts and ends on. */
interface NumberedRecord {
  fields: string[];
  line: number;
  lastLine: number;
}

/** Longest record the parser buffers: larger ones are nearly always an unclosed quote. */
const MAX_RECORD_CHARS = 8 * 1024 * 1024;

const LINE_FEED = 10;
const CARRIAGE_RETURN = 13;

/** Line breaks inside the fields of one record: CRLF, LF and a lone CR each count once. */
function countLineBreaks(fields: readonly string[]): number {
  let breaks = 0;
  for (const value of fields) {
    for (let i = 0; i < value.length; i++) {
      const code = value.charCodeAt(i);
      if (code === LINE_FEED) breaks++;
      else if (code === CARRIAGE_RETURN && value.charCodeAt(i + 1) !== LINE_FEED) breaks++;
    }
  }
  return breaks;
}

function isBlankRecord(fields: readonly string[]): boolean {
  return fields.length === 1 && fields[0].trim() === "";
}

/** csv-parse's error, restated as a DataError at the line where the failing record starts. */
function toDataError(error: CsvError, file: string, line: number): DataError {
  const where = { file, line };
  switch (error.code) {
    case "INVALID_OPENING_QUOTE":
      return new DataError("bad-quote", where, 'a quote inside an unquoted field; RFC 4180 wants such a field enclosed in quotes, with each inner quote doubled ("")');
    case "CSV_INVALID_CLOSING_QUOTE":
      return new DataError("bad-quote", where, 'a closing quote is followed by other characters; expected a delimiter or the end of the line (an inner quote must be doubled: "")');
    case "CSV_QUOTE_NOT_CLOSED":
      return new DataError("bad-quote", where, "a quoted field that starts in this record is never closed before the end of the file");
    case "CSV_MAX_RECORD_SIZE":
      return new DataError("record-too-large", where, `the record is longer than ${MAX_RECORD_CHARS} characters; most often a quote that is never closed`);
    default:
      return new DataError("bad-csv", where, `the CSV parser refused the record (${error.message})`);
  }
}

/** Index of each requested field in the header; throws for a missing or repeated field. */
function locateFields(header: NumberedRecord, wanted: readonly string[], context: ReadContext): Map<string, number> {
  const names = header.fields.map((name) => name.trim());
  const found = names.map((name) => `"${name}"`).join(", ");
  const positions = new Map<string, number>();
  for (const field of wanted) {
    const index = names.indexOf(field);
    const where = { file: context.file, line: header.line, field };
    if (index === -1) {
      const hint = names.length === 1 ? ` (only one column: is this really ${context.format.toUpperCase()}? pass --format)` : "";
      throw new DataError("missing-column", where, `the header has no column "${field}"; columns found: ${found}${hint}`);
    }
    if (names.indexOf(field, index + 1) !== -1) {
      throw new DataError("duplicate-column", where, `the header names column "${field}" more than once; columns found: ${found}`);
    }
    positions.set(field, index);
  }
  return positions;
}

/**
 * Examples from a CSV or TSV byte stream with a header row, yielded one by one.
 * @example for await (const example of readCsv(createReadStream("data.csv"), context)) {}
 */
export async function* readCsv(source: Readable, context: ReadContext): AsyncGenerator<Example> {
  const { file, report } = context;
  let nextLine = 1;
  // A syntax error is fatal, but the records parsed before it are still in the stream's
  // buffer. Letting csv-parse fail the stream would drop them (and any earlier bad row
  // with them), so the error is held here, the input is cut off, and it is thrown once
  // those records have been handled.
  let syntaxError: DataError | null = null;
  const parserOptions: CsvParseOptions<NumberedRecord | null, string[]> = {
    delimiter: context.format === "tsv" ? "\t" : ",",
    quote: context.format === "tsv" ? false : '"',
    bom: true,
    // Counts are checked below so a wrong-length row arrives in order, with its line, and
    // can be skipped; csv-parse would otherwise end the stream on the first one.
    relax_column_count: true,
    skip_empty_lines: false,
    // CRLF and LF both end a record, whichever the file starts with: a CRLF export with LF
    // rows appended (or the reverse) is read row by row instead of gluing rows together.
    record_delimiter: ["\r\n", "\n"],
    max_record_size: MAX_RECORD_CHARS,
    skip_records_with_error: true,
    on_skip: (error) => {
      if (syntaxError !== null || error === undefined) return;
      syntaxError = toDataError(error, file, nextLine);
      source.unpipe(parser);
      source.destroy();
      // Ending from inside the parser's own callback is unsafe; do it once this chunk is done.
      setImmediate(() => {
        if (!parser.destroyed && !parser.writableEnded) parser.end();
      });
    },
    on_record: (fields: string[]): NumberedRecord | null => {
      if (syntaxError !== null) return null; // parsed after the broken record: untrustworthy
      const line = nextLine;
      const last = fields.length - 1;
      // With LF records a CRLF line leaves its CR in the last field: it is line-ending, not data.
      if (fields[last].endsWith("\r")) fields[last] = fields[last].slice(0, -1);
      nextLine += 1 + countLineBreaks(fields);
      return isBlankRecord(fields) ? null : { fields, line, lastLine: nextLine - 1 };
    },
  };
  // Without `columns`, csv-parse's overloads type records as string[]; on_record changes that.
  const parser = parse(parserOptions as unknown as CsvParseOptions);
  // A read error of the source (not a syntax error) fails the parse, and so the iteration.
  source.on("error", (error) => parser.destroy(error));
  source.pipe(parser);

  const wanted = context.requireLabels ? [...context.textFields, context.labelField] : [...context.textFields];
  if (context.groupField !== null) wanted.push(context.groupField);
  let header: NumberedRecord | null = null;
  let textIndexes: number[] = [];
  let labelIndex = -1;
  let groupIndex = -1;
  try {
    for await (const record of parser as AsyncIterable<NumberedRecord>) {
      if (header === null) {
        header = record;
        const positions = locateFields(header, wanted, context);
        textIndexes = context.textFields.map((field) => positions.get(field) as number);
        labelIndex = positions.get(context.labelField) ?? header.fields.map((name) => name.trim()).indexOf(context.labelField);
        if (context.groupField !== null) groupIndex = positions.get(context.groupField) as number;
        continue;
      }
      report.rows++;
      const { fields, line, lastLine } = record;
      if (fields.length !== header.fields.length) {
        const span = lastLine > line ? `; the record runs over lines ${line}–${lastLine} (a quoted field with line breaks, or a quote that is not closed)` : "";
        const detail = `expected ${header.fields.length} fields (as in the header on line ${header.line}), found ${fields.length}${span}`;
        rejectBadRow(context, new DataError("column-count", { file, line }, detail), lastLine - line + 1);
        continue;
      }
      const labels = labelIndex === -1 ? null : splitLabelCell(fields[labelIndex], context.labelSep);
      const example = finishRow(context, line, textIndexes.map((index) => fields[index]), labels, groupIndex === -1 ? undefined : fields[groupIndex]);
      if (example !== null) yield example;
    }
  } finally {
    // Also reached when the consumer stops early: release the file.
    source.destroy();
    parser.destroy();
  }
  if (syntaxError !== null) throw syntaxError;
  if (header === null) {
    const columns = wanted.map((field) => `"${field}"`).join(", ");
    throw new DataError("missing-column", { file }, `the file is empty; expected a header row naming ${columns}`);
  }
}
