// Public surface of the data readers: CSV, TSV and JSONL files to examples.

export type { DataFormat, Example, ReadOptions } from "./read-types.ts";
export type { ReadReport } from "./read-report.ts";
export { DataError } from "./data-error.ts";
export { createReadReport } from "./read-report.ts";
export { readExamples, readExamplesFromText } from "./read-examples.ts";
