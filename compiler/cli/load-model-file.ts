// Reads a model file for a command; a corrupt file is refused with the file name in the message.

import { readFileSync } from "node:fs";
import { loadModel } from "../../runtime/format/load-model.ts";
import { ModelFormatError } from "../../runtime/errors.ts";
import type { Model } from "../../runtime/model/model.ts";
import { checkInputFile } from "./input-path.ts";
import type { FieldDefaults } from "./read-data.ts";

/** Loads `path`; throws InputPathError when it is missing or a folder, ModelFormatError with
 * the path prefixed when it is not a good model, or a plain error when it cannot be read. */
export function loadModelFile(path: string): Model {
  checkInputFile(path, "model file");
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(path);
  } catch (error) {
    throw new Error(`cannot read model file ${path}: ${(error as Error).message}`);
  }
  try {
    return loadModel(bytes);
  } catch (error) {
    if (error instanceof ModelFormatError) throw new ModelFormatError(error.code, `${path}: ${error.message}`);
    throw error;
  }
}

/** The text and label fields and the label separator the model was built with (so eval,
 * classify, compare and report read data the same way unless told otherwise). */
export function fieldsOf(model: Model): FieldDefaults {
  const fields = model.meta.provenance.fields as { text?: unknown; label?: unknown; labelSep?: unknown } | null | undefined;
  const text = Array.isArray(fields?.text) && fields.text.every((f) => typeof f === "string") ? (fields.text as string[]) : ["text"];
  const label = typeof fields?.label === "string" ? fields.label : "label";
  const defaults: FieldDefaults = { textFields: text, labelField: label };
  if (typeof fields?.labelSep === "string" && fields.labelSep !== "") defaults.labelSep = fields.labelSep;
  return defaults;
}
