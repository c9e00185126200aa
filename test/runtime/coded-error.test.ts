// The one factory behind every coded error (runtime/coded-error.ts): each kind keeps its
// name, its code, its message and its own fields, and stays an Error and its own class.
// An Error subclass setting `name` and a `code` string is Node's own convention for
// system errors (Node.js docs, "Errors": error.code, error.name); no other source.

import { describe, expect, it } from "vitest";
import { codedErrorClass } from "../../runtime/coded-error.ts";
import { InputError, ModelFormatError } from "../../runtime/errors.ts";
import { ApiError } from "../../runtime/worker/api-error.ts";
import { DataError, isSkippableDataError } from "../../compiler/read/data-error.ts";
import { MetricsInputError, metricsInputError } from "../../compiler/metrics/metrics-input-error.ts";

describe("codedErrorClass", () => {
  it("makes a class whose errors carry the code, the message and the kind's name", () => {
    const CODES = { "too-long": "the value is longer than allowed" } as const;
    class LengthError extends codedErrorClass("LengthError", CODES) {}
    const error = new LengthError("too-long", "name: 300 characters, at most 200");
    expect(error).toBeInstanceOf(Error);
    expect(error).toBeInstanceOf(LengthError);
    expect(error.name).toBe("LengthError");
    expect(error.code).toBe("too-long");
    expect(error.message).toBe("name: 300 characters, at most 200");
    expect(String(error)).toBe("LengthError: name: 300 characters, at most 200");
  });

  it("keeps two kinds apart: an error of one is not an instance of the other", () => {
    expect(new InputError("not-text", "x")).not.toBeInstanceOf(ModelFormatError);
    expect(new ModelFormatError("checksum", "x")).not.toBeInstanceOf(InputError);
  });

  it("keeps each kind's own fields: a byte offset, an HTTP status, a file and line", () => {
    const format = new ModelFormatError("truncated", "the header ends early", 12);
    expect([format.name, format.code, format.offset, format.message]).toEqual(["ModelFormatError", "truncated", 12, "the header ends early (at byte 12)"]);

    const api = new ApiError("missing-text", 'the body needs "text"');
    expect([api.name, api.code, api.status]).toEqual(["ApiError", "missing-text", 422]);

    const data = new DataError("bad-json", { file: "a.jsonl", line: 3 }, "expected a JSON object");
    expect([data.name, data.code, data.file, data.line, data.field, data.message]).toEqual(["DataError", "bad-json", "a.jsonl", 3, null, "a.jsonl line 3: expected a JSON object"]);
    expect(isSkippableDataError(data)).toBe(true);

    const metrics = metricsInputError("bad-label", "computeClassificationMetrics", "gold[3] = 7");
    expect(metrics).toBeInstanceOf(MetricsInputError);
    expect([metrics.name, metrics.code, metrics.message]).toEqual(["MetricsInputError", "bad-label", "computeClassificationMetrics: gold[3] = 7"]);
  });
});
