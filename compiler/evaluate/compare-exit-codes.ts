// The CI gates' exit codes, on their own so the CLI's command table can name them without
// loading the comparison code.

/** Exit codes of `sluice compare` (1 and 2 are the CLI's error and usage codes). */
export const COMPARE_EXIT_CODES = {
  /** Every requested gate passed. */
  pass: 0,
  /** --require-better: the candidate is not significantly better (needs p < 0.05 and c > b). */
  notBetter: 3,
  /** --max-regression: the candidate's metric dropped by more than allowed. */
  regression: 4,
} as const;
