// The entry points: a file on disk or a string in memory go through the same readers,
// because both become a byte stream first.

import { open } from "node:fs/promises";
import { Readable } from "node:stream";
import { DataError } from "./data-error.ts";
import { createReadContext, type ReadContext } from "./read-context.ts";
import { readCsv } from "./read-csv.ts";
import { readJsonl } from "./read-jsonl.ts";
import { createReadReport, type ReadReport } from "./read-report.ts";
import type { Example, ReadOptions } from "./read-types.ts";

/** A Node system error (ENOENT, EISDIR, EIO...) as raised by fs streams. */
function isSystemError(error: unknown): error is Error & { syscall: string } {
  return error instanceof Error && typeof (error as { syscall?: unknown }).syscall === "string";
}

async function* readSource(source: Readable, context: ReadContext): AsyncGenerator<Example> {
  try {
    yield* context.format === "jsonl" ? readJsonl(source, context) : readCsv(source, context);
  } catch (error) {
    // A read that fails midway (a vanished network mount, a bad disk) is still about the file.
    if (isSystemError(error)) {
      throw new DataError("unreadable", { file: context.file }, `cannot read the file (${error.message})`);
    }
    throw error;
  }
}

/** Opens `file` for streaming; a missing file or a directory is a DataError "unreadable". */
async function openDataFile(file: string): Promise<Readable> {
  let handle;
  try {
    handle = await open(file, "r");
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") throw new DataError("unreadable", { file }, "no such file");
    const reason = error instanceof Error ? error.message : String(error);
    throw new DataError("unreadable", { file }, `cannot open the file (${reason})`);
  }
  if ((await handle.stat()).isDirectory()) {
    await handle.close();
    throw new DataError("unreadable", { file }, "is a directory; expected a data file");
  }
  // The stream owns the handle from here: it closes it at the end or when destroyed.
  return handle.createReadStream();
}

/**
 * Streams the examples of a CSV, TSV or JSONL file, one by one; the file is never held
 * in memory whole. Counts go into `report` as reading proceeds.
 * @example
 * const report = createReadReport("train.csv");
 * for await (const example of readExamples("train.csv", { labelSep: "|" }, report)) use(example);
 * console.log(`${report.examples} examples, ${report.emptyText} with empty text`);
 */
export async function* readExamples(
  file: string,
  options: ReadOptions = {},
  report: ReadReport = createReadReport(file),
): AsyncGenerator<Example> {
  // Opened first, so a missing file or a folder is named as such, not as a name without a known extension.
  const source = await openDataFile(file);
  let context: ReadContext;
  try {
    context = createReadContext(file, options, report);
  } catch (error) {
    source.destroy();
    throw error;
  }
  yield* readSource(source, context);
}

/**
 * The same as readExamples over a string in memory (tests, stdin); `name` stands in for
 * the file name in messages and, without options.format, decides the format.
 * @example
 * for await (const example of readExamplesFromText("inline.jsonl", '{"text":"hi","label":"greeting"}\n')) use(example);
 */
export async function* readExamplesFromText(
  name: string,
  text: string,
  options: ReadOptions = {},
  report: ReadReport = createReadReport(name),
): AsyncGenerator<Example> {
  const context = createReadContext(name, options, report);
  // As bytes, like a file, so BOM handling and decoding take the same path.
  yield* readSource(Readable.from([Buffer.from(text, "utf8")]), context);
}
