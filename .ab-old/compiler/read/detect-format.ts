// Which reader a file goes to: an explicit format wins, else the file extension decides.

import { DataError } from "./data-error.ts";
import type { DataFormat } from "./read-types.ts";

/** Known extensions (lower case, with the dot) and the format each one means. */
const FORMAT_BY_EXTENSION: Readonly<Record<string, DataFormat>> = {
  ".csv": "csv",
  ".tsv": "tsv",
  ".tab": "tsv",
  ".jsonl": "jsonl",
  ".ndjson": "jsonl",
  // A .json file is read as one JSON object per line; the JSONL reader says so when it
  // meets a JSON array instead.
  ".json": "jsonl",
};

const KNOWN_FORMATS: readonly DataFormat[] = ["csv", "tsv", "jsonl"];

/**
 * The format to read `file` as: `requested` if given, else from the extension (any case).
 * Throws DataError "unknown-format" naming the known extensions.
 * @example detectFormat("train.TSV") // "tsv"
 */
export function detectFormat(file: string, requested?: DataFormat): DataFormat {
  if (requested !== undefined) {
    if (KNOWN_FORMATS.includes(requested)) return requested;
    throw new DataError(
      "unknown-format",
      { file },
      `unknown format "${String(requested)}"; expected one of ${KNOWN_FORMATS.join(", ")}`,
    );
  }
  const baseName = file.slice(Math.max(file.lastIndexOf("/"), file.lastIndexOf("\\")) + 1);
  const dot = baseName.lastIndexOf(".");
  const extension = dot > 0 ? baseName.slice(dot).toLowerCase() : "";
  const format = FORMAT_BY_EXTENSION[extension];
  if (format !== undefined) return format;
  const known = Object.keys(FORMAT_BY_EXTENSION).join(", ");
  const found = extension === "" ? "the name has no extension" : `extension "${extension}" is not known`;
  throw new DataError(
    "unknown-format",
    { file },
    `cannot tell the data format: ${found}; known extensions are ${known}; pass --format ${KNOWN_FORMATS.join("|")}`,
  );
}
