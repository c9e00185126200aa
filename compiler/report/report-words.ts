// The report's axis titles and legend words in one place, in Sluice's own plain phrasing:
// what the data says, what the model said, and how often its top score was right.

export const REPORT_WORDS = {
  /** Confusion map: columns and rows. */
  modelAnswer: "model's answer",
  dataLabel: "label in the data",
  /** Confusion map legend: how much of a row a cell holds; a row with no examples. */
  rowShare: "part of the row",
  emptyRow: "row empty",
  /** Reliability diagram: axes, bars, marks and the diagonal. */
  topScore: "top score",
  shareRight: "share right",
  barMeaning: "share right in the bin",
  markMeaning: "average top score in the bin",
  diagonalMeaning: "score = share right",
} as const;
