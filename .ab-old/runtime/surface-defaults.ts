// The defaults every surface shares: the library (`model.classify`, `model.explain`), the
// CLI, `sluice serve` and the Worker read them from here, so the same model answers the same
// question the same way wherever it is asked.

export const SURFACE_DEFAULTS = {
  /** Labels `classify` lists when `top` is not given (library, CLI, HTTP): the model's own
   * choice — the best label for a softmax or tree head, every label above its threshold for a
   * sigmoid head. */
  classifyTop: "the best label (sigmoid head: every label above its threshold)",
  /** Top labels `explain` explains (CLI, HTTP, library). */
  explainTop: 1,
  /** Features listed per explained label (CLI, HTTP, library). */
  explainFeatures: 10,
  /**
   * An "allow" whose top score is below this becomes "review" (HTTP, e-mail and the CLI's
   * decision column; the operator may change it with REVIEW_BELOW). Applies to models with or
   * without a policy of their own, so a model without one still sends weak guesses to a person.
   */
  reviewBelow: 0.6,
} as const;
