import { describe, it, expect } from "vitest";
import { precisionAtK, rankLabelsByScore, recallAtK } from "../../../compiler/metrics/index.ts";

// torchmetrics API reference, RetrievalPrecision and RetrievalRecall docstring examples
// (read in stored torchmetrics source):
//   indexes = [0, 0, 0, 1, 1, 1, 1], preds = [0.2, 0.3, 0.5, 0.1, 0.3, 0.5, 0.2],
//   target = [False, False, True, False, True, False, True]
//   RetrievalPrecision(top_k=2) → 0.5000, RetrievalRecall(top_k=2) → 0.7500
// Each query becomes one example whose items are its labels.
const QUERY_SCORES = [
  [0.2, 0.3, 0.5],
  [0.1, 0.3, 0.5, 0.2],
];
const QUERY_GOLD = [[2], [1, 3]];

describe("precisionAtK", () => {
  it("matches the torchmetrics RetrievalPrecision docstring example", () => {
    const ranked = QUERY_SCORES.map((scores) => rankLabelsByScore(scores));
    expect(precisionAtK(QUERY_GOLD, ranked, 2)).toBe(0.5);
  });

  it("divides by k even when fewer than k labels are ranked", () => {
    // Information-retrieval definition P@k = relevant in top k / k (common practice, no source).
    expect(precisionAtK([[0]], [[0]], 4)).toBe(0.25);
  });

  it("rejects a label ranked twice", () => {
    expect(() => precisionAtK([[0]], [[0, 0]], 2)).toThrow(/ranked\[0\]\[1\] = 0 repeats a label ranked higher/);
  });

  it("rejects k below one", () => {
    expect(() => precisionAtK([[0]], [[0]], 0)).toThrow(/k = 0, expected an integer ≥ 1/);
  });
});

describe("recallAtK", () => {
  it("matches the torchmetrics RetrievalRecall docstring example", () => {
    const ranked = QUERY_SCORES.map((scores) => rankLabelsByScore(scores));
    expect(recallAtK(QUERY_GOLD, ranked, 2)).toBe(0.75);
  });

  it("scores an example without gold labels as 0", () => {
    // torchmetrics retrieval metrics default to empty_target_action="neg" (read in the stored
    // source); that "neg" scores such a query 0 is from memory. Here: (1 + 0) / 2.
    expect(recallAtK([[0], []], [[0, 1], [0, 1]], 1)).toBe(0.5);
  });
});

describe("rankLabelsByScore", () => {
  it("orders labels by descending score", () => {
    // The torchmetrics example's second query: scores [0.1, 0.3, 0.5, 0.2] rank as 2, 1, 3, 0.
    expect(Array.from(rankLabelsByScore([0.1, 0.3, 0.5, 0.2]))).toEqual([2, 1, 3, 0]);
  });

  it("keeps the lower label index first among equal scores", () => {
    // Tie rule documented in top-k-metrics.ts (project convention).
    expect(Array.from(rankLabelsByScore(new Float32Array([0.5, 0.9, 0.5])))).toEqual([1, 0, 2]);
  });
});
