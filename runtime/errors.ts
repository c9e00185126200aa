// The runtime's typed errors: one code map per error kind, each class made by the one
// factory (coded-error.ts), so callers switch on `code` and map it to an exit or HTTP status.

import { codedErrorClass } from "./coded-error.ts";

/** Why a model file was refused. */
export const MODEL_FORMAT_ERROR_CODES = {
  "bad-magic": "the file does not start with the Sluice magic number",
  "unsupported-version": "the format version is not one this runtime reads",
  truncated: "the file ends before a structure it declares",
  "bad-header": "the MessagePack header is unreadable or has a missing or invalid field",
  "bad-section": "a section is missing, misaligned, overlapping or of the wrong size",
  checksum: "the CRC-32 of the file does not match its trailer",
} as const;

export type ModelFormatErrorCode = keyof typeof MODEL_FORMAT_ERROR_CODES;

/** A model file that cannot be used. Nothing of it was loaded. */
export class ModelFormatError extends codedErrorClass("ModelFormatError", MODEL_FORMAT_ERROR_CODES) {
  /** Byte offset in the file where the problem was found, when there is one. */
  readonly offset: number | null;

  constructor(code: ModelFormatErrorCode, message: string, offset: number | null = null) {
    super(code, offset === null ? message : `${message} (at byte ${offset})`);
    this.offset = offset;
  }
}

/** Why a call into the runtime was refused. */
export const INPUT_ERROR_CODES = {
  "not-text": "the input is not a string",
  "bad-option": "an option has an invalid value",
} as const;

export type InputErrorCode = keyof typeof INPUT_ERROR_CODES;

/** A call with an argument the runtime cannot use. */
export class InputError extends codedErrorClass("InputError", INPUT_ERROR_CODES) {}
