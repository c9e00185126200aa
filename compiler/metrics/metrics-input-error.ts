// One error type for every metric function, so callers (eval, compare, report) can tell
// bad input apart from bugs and show the message as-is: it names the function, the
// argument, the index and what was expected.

import { codedErrorClass } from "../../runtime/coded-error.ts";

/** Why a metric function refused its input. */
export const METRICS_INPUT_ERROR_CODES = {
  "length-mismatch": "two inputs that must line up have different lengths",
  "bad-label": "a label index is not an integer in [0, labelCount)",
  "bad-number": "a number is not finite or lies outside its allowed range",
  "bad-argument": "an option or size argument is invalid",
  "no-data": "the computation needs at least one example",
} as const;

export type MetricsInputErrorCode = keyof typeof METRICS_INPUT_ERROR_CODES;

/** Thrown by `compiler/metrics` functions on bad input; `code` says which kind. */
export class MetricsInputError extends codedErrorClass("MetricsInputError", METRICS_INPUT_ERROR_CODES) {}

/**
 * Builds a `MetricsInputError` whose message starts with the function that refused the input.
 * @example throw metricsInputError("bad-label", "computeClassificationMetrics", "gold[3] = 7, expected an integer in [0, 5)")
 */
export function metricsInputError(
  code: MetricsInputErrorCode,
  functionName: string,
  detail: string,
): MetricsInputError {
  return new MetricsInputError(code, `${functionName}: ${detail}`);
}
