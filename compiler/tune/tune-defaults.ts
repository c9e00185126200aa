// What `sluice tune` searches for by default, kept apart from the search so the CLI's table can
// name it without loading it. The default time budget, derived from the data: a multiple of what one
// build with the default settings takes on it, so a small file is tuned in seconds and a
// large one gets time in proportion. The multiple buys about one bracket of successive
// halving (nine trials on 1/9 of the data, three on 1/3, one on all of it costs about
// 1 + 1 + 1 = 3 default builds per fold) several times over; the floor keeps tiny data from
// ending the search after the baseline.

/** Default budget = this many default builds. */
export const TUNE_BUDGET_BUILDS = 25;
/** The default budget is never below this many seconds. */
export const TUNE_BUDGET_FLOOR_SECONDS = 20;

/**
 * The default budget for data on which one default build took `buildSeconds`.
 * @example defaultTuneSeconds(2) // 50
 */
export function defaultTuneSeconds(buildSeconds: number): number {
  return Math.max(TUNE_BUDGET_FLOOR_SECONDS, TUNE_BUDGET_BUILDS * buildSeconds);
}

/** The rule in words, for help and README. */
export const TUNE_BUDGET_RULE = `${TUNE_BUDGET_BUILDS} × one default build's time on the data, at least ${TUNE_BUDGET_FLOOR_SECONDS}s`;

/** What --objective accepts; the first is the default. */
export const OBJECTIVES = ["macro-f1", "accuracy", "recall"] as const;
