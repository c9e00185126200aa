// Shared argument checks for the metric functions. Each throws a MetricsInputError that
// names the function, the argument and the offending index, so a bad eval file is easy to trace.

import { metricsInputError } from "./metrics-input-error.ts";

/** Anything indexable holding numbers: plain arrays and typed arrays alike. */
export type NumberList = ArrayLike<number>;

/** Throws unless `a` and `b` have the same length. */
export function checkSameLength(
  functionName: string,
  nameA: string,
  a: ArrayLike<unknown>,
  nameB: string,
  b: ArrayLike<unknown>,
): void {
  if (a.length !== b.length) {
    throw metricsInputError(
      "length-mismatch",
      functionName,
      `${nameA} has ${a.length} entries but ${nameB} has ${b.length}; expected one entry per example in both`,
    );
  }
}

/** Throws unless `value` is an integer label index in [0, labelCount). */
export function checkLabelIndex(functionName: string, where: string, value: number, labelCount: number): void {
  if (!Number.isInteger(value) || value < 0 || value >= labelCount) {
    throw metricsInputError(
      "bad-label",
      functionName,
      `${where} = ${value}, expected an integer label index in [0, ${labelCount})`,
    );
  }
}

/** Throws unless `value` is a finite number in [0, 1]. */
export function checkUnitInterval(functionName: string, where: string, value: number): void {
  if (!(value >= 0 && value <= 1)) {
    throw metricsInputError("bad-number", functionName, `${where} = ${value}, expected a number in [0, 1]`);
  }
}

/** Throws unless `value` is an integer ≥ `minimum`. */
export function checkInteger(functionName: string, where: string, value: number, minimum: number): void {
  if (!Number.isInteger(value) || value < minimum) {
    throw metricsInputError("bad-argument", functionName, `${where} = ${value}, expected an integer ≥ ${minimum}`);
  }
}

/** Throws unless `labelNames` has exactly `labelCount` distinct names. */
export function checkLabelNames(functionName: string, labelCount: number, labelNames: readonly string[]): void {
  checkInteger(functionName, "labelCount", labelCount, 1);
  if (labelNames.length !== labelCount) {
    throw metricsInputError(
      "length-mismatch",
      functionName,
      `labelNames has ${labelNames.length} names but labelCount is ${labelCount}; expected one name per label`,
    );
  }
  const seen = new Set<string>();
  for (let i = 0; i < labelNames.length; i++) {
    if (seen.has(labelNames[i])) {
      throw metricsInputError(
        "bad-argument",
        functionName,
        `labelNames[${i}] = ${JSON.stringify(labelNames[i])} repeats an earlier name; expected distinct names`,
      );
    }
    seen.add(labelNames[i]);
  }
}

/** `numerator / denominator`, or 0 when the denominator is 0 (scikit-learn's zero_division=0). */
export function divideOrZero(numerator: number, denominator: number): number {
  return denominator === 0 ? 0 : numerator / denominator;
}
