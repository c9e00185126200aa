// Public surface of compiler/metrics: pure metric and statistics functions, no I/O.

export { computeClassificationMetrics } from "./classification-metrics.ts";
export type { ClassificationMetrics, LabelScores } from "./classification-metrics.ts";
export { logLoss, LOG_LOSS_CLIP } from "./log-loss.ts";
export { computeMultilabelMetrics, subsetAccuracy, hammingLoss } from "./multilabel-metrics.ts";
export type { LabelSet, MultilabelMetrics } from "./multilabel-metrics.ts";
export { precisionAtK, recallAtK, rankLabelsByScore } from "./top-k-metrics.ts";
export { expectedCalibrationError, reliabilityBins } from "./calibration.ts";
export type { CorrectnessList, ReliabilityBin } from "./calibration.ts";
export { fitTemperature, TEMPERATURE_MIN, TEMPERATURE_MAX } from "./temperature-scaling.ts";
export type { TemperatureFit } from "./temperature-scaling.ts";
export { wilsonInterval, Z_95 } from "./wilson-interval.ts";
export type { Interval } from "./wilson-interval.ts";
export { mcnemarTest, MCNEMAR_EXACT_BELOW } from "./mcnemar-test.ts";
export type { McNemarResult } from "./mcnemar-test.ts";
export { binomialTestTwoSided } from "./binomial-test.ts";
export { chiSquareSurvivalOneDegree } from "./chi-square-survival.ts";
export { complementaryErrorFunction } from "./complementary-error-function.ts";
export {
  precisionRecallCurve,
  thresholdForTargetPrecision,
  thresholdForTargetRecall,
} from "./precision-recall-curve.ts";
export type { CurvePoint } from "./precision-recall-curve.ts";
export { MetricsInputError, metricsInputError, METRICS_INPUT_ERROR_CODES } from "./metrics-input-error.ts";
export type { MetricsInputErrorCode } from "./metrics-input-error.ts";
