// The comparison as markdown: the table, the notes that say what each row measures, and
// the ratios of Sluice against the other systems from the same run.

import { type ComparisonRow, type SystemRole } from "./comparison-rows.ts";
import { markdownTable } from "./results-writer.ts";

const fixed = (value: number | null, digits: number) => (value === null || !Number.isFinite(value) ? "—" : value.toFixed(digits));
const grouped = (value: number | null) => (value === null ? "—" : Math.round(value).toLocaleString("en-US"));
const microseconds = (value: number | null) => (value === null ? "—" : value >= 1000 ? Math.round(value).toLocaleString("en-US") : value.toFixed(1));

/**
 * The table of rows as markdown (status text stands in for missing numbers).
 * @example console.log(comparisonTable(await runComparison()));
 */
export function comparisonTable(rows: readonly ComparisonRow[]): string {
  const headers = ["dataset", "system", "train s", "accuracy", "macro-F1", "µs/doc p50", "µs/doc p99", "model bytes", "load ms"];
  const body = rows.map((row) => {
    const train = row.trainSeconds === null && row.status !== "ok" ? row.statusText ?? row.status : fixed(row.trainSeconds, 2);
    return [row.dataset, row.system, train, fixed(row.accuracy, 4), fixed(row.macroF1, 4), microseconds(row.classify?.p50 ?? null), microseconds(row.classify?.p99 ?? null), grouped(row.modelBytes), fixed(row.loadMs, 2)];
  });
  return markdownTable(headers, body, ["left", "left", "right", "right", "right", "right", "right", "right", "right"]);
}

/**
 * Lines comparing Sluice (compiled, 1 thread, default settings) with natural's Bayes
 * classifier and with the sklearn reference, per dataset, from the same run.
 * @example comparisonRatios(rows).forEach((line) => console.log(line));
 */
export function comparisonRatios(rows: readonly ComparisonRow[]): string[] {
  const lines: string[] = [];
  const points = (a: number, b: number) => {
    const difference = (a - b) * 100;
    return Math.abs(difference) < 0.005 ? "±0.00 points" : `${difference > 0 ? "+" : "−"}${Math.abs(difference).toFixed(2)} points`;
  };
  const times = (x: number) => `${x >= 10 ? x.toFixed(0) : x.toFixed(1)}×`;
  // A ratio of "their time / our time": above 1 Sluice is faster, below 1 it is slower.
  const speed = (ratio: number, verb: string) => (ratio >= 1 ? `${verb} ${times(ratio)} faster` : `${verb} ${times(1 / ratio)} slower`);
  for (const dataset of [...new Set(rows.map((r) => r.dataset))]) {
    const pick = (role: SystemRole) => rows.find((r) => r.dataset === dataset && r.role === role && (r.threads === 1 || r.threads === null));
    const sluice = pick("sluice-compiled");
    if (!sluice || sluice.trainSeconds === null || sluice.accuracy === null || !sluice.classify) continue;
    lines.push(`${dataset} — Sluice compiled int8, 1 thread (${grouped(sluice.modelBytes)} bytes):`);
    const bayes = pick("natural-bayes");
    if (bayes?.status === "ok" && bayes.trainSeconds !== null && bayes.accuracy !== null && bayes.classify) {
      lines.push(`  vs natural Bayes: ${speed(bayes.trainSeconds / sluice.trainSeconds, "trains")}, ${speed(bayes.classify.p50 / sluice.classify.p50, "classifies")} (p50), accuracy ${points(sluice.accuracy, bayes.accuracy)}`);
    } else if (bayes?.status === "too-slow" && bayes.trainSeconds === null) {
      const capSeconds = bayes.details.capSeconds as number;
      const bound = capSeconds / sluice.trainSeconds;
      lines.push(
        bound >= 1
          ? `  vs natural Bayes: trains more than ${times(bound)} faster (natural did not finish training within its ${capSeconds} s cap; Sluice's build took ${fixed(sluice.trainSeconds, 1)} s)`
          : `  vs natural Bayes: no training ratio (natural did not finish within its ${capSeconds} s cap, shorter than Sluice's ${fixed(sluice.trainSeconds, 1)} s build)`,
      );
      const subset = pick("natural-bayes-subset");
      if (subset?.status === "ok" && subset.trainSeconds !== null && subset.accuracy !== null && subset.classify) {
        lines.push(`    vs natural Bayes trained on a ${subset.trainExamples}-example subset in ${fixed(subset.trainSeconds, 1)} s (a smaller vocabulary, so it classifies faster than the full model would): Sluice ${speed(subset.classify.p50 / sluice.classify.p50, "classifies")} (p50), accuracy ${points(sluice.accuracy, subset.accuracy)}`);
      }
    } else if (bayes) lines.push(`  vs natural Bayes: no ratio (${bayes.statusText})`);
    const sklearn = pick("sklearn");
    if (sklearn?.status === "ok" && sklearn.accuracy !== null && sklearn.modelBytes !== null && sluice.modelBytes !== null) {
      const budget = pick("sluice-budget");
      const budgetText = budget?.modelBytes && budget.accuracy !== null ? `; max-bytes row: sklearn bytes / its bytes = ${times(sklearn.modelBytes / budget.modelBytes)}, accuracy ${points(budget.accuracy, sklearn.accuracy)}` : "";
      const twentieth = pick("sluice-twentieth");
      const twentiethText = twentieth?.modelBytes && twentieth.accuracy !== null ? `; sklearn/20 row: ${times(sklearn.modelBytes / twentieth.modelBytes)} smaller, accuracy ${points(twentieth.accuracy, sklearn.accuracy)}` : "";
      lines.push(`  vs scikit-learn TF-IDF + LR: accuracy ${points(sluice.accuracy, sklearn.accuracy)}, macro-F1 ${points(sluice.macroF1 ?? NaN, sklearn.macroF1 ?? NaN)}; sklearn bytes / Sluice bytes = ${times(sklearn.modelBytes / sluice.modelBytes)}${budgetText}${twentiethText}`);
      if (sklearn.trainSeconds !== null && sklearn.classify) lines.push(`    (sklearn fit ${fixed(sklearn.trainSeconds, 2)} s vs Sluice build ${fixed(sluice.trainSeconds, 2)} s; sklearn predict([text]) p50 ${microseconds(sklearn.classify.p50)} µs, batch ${microseconds(sklearn.batchUsPerDoc)} µs/doc)`);
    } else if (sklearn) lines.push(`  vs scikit-learn: no ratio (${sklearn.statusText})`);
  }
  return lines;
}

/**
 * What each row measures, printed under the table so the numbers cannot be misread
 * (the caps and repeat counts are read from the rows, so a --quick run says its own).
 * @example comparisonNotes(rows).forEach((note) => console.log(`- ${note}`));
 */
export function comparisonNotes(rows: readonly ComparisonRow[]): string[] {
  const capOf = (role: SystemRole) => rows.find((r) => r.role === role)?.details.capSeconds ?? "?";
  const loadRepeats = rows.find((r) => r.role === "sluice-compiled")?.details.loadRepeats ?? "?";
  const calls = Math.min(...rows.filter((r) => r.role.startsWith("sluice")).map((r) => r.classify?.calls ?? Infinity));
  return [
    "All systems train on the same training split and are scored on the same test split (SpamAssassin: the fixture's murmur3 80/20 split; support topics: murmur3 of the CSV line number % 5 = 0 is test). Accuracy and macro-F1 come from each system's test predictions, scored by compiler/metrics.",
    "Sluice train s = the whole build() call (encode, train, prune, quantize, fine-tune the output layer, calibrate, write, verify) with default settings; it trains on 90% of the training split and keeps 10% for calibration and policy (default holdout). Draft-only training seconds are in the JSON (details.draftTrainSeconds).",
    "Sluice compiled = the default build (int8; logit rows, the output layer multiplied in; TF-IDF, 5 epochs; the default 1 MiB budget prunes rows when the data needs more). max-bytes = the same with a smaller size budget (rows pruned to fit). Sluice draft = a separate build with precision float32, fine-tune epochs 0, keep-features 0, no max-bytes, output layer kept (no folding): the draft itself as a float32 file (1 thread: the identical draft, same seed). 2 threads = settings.threads 2 (Hogwild, not deterministic).",
    `µs/doc = one classify call per text after a warm-up, performance.now around each call, percentiles by nearest rank over the sorted calls (Sluice: ${Number.isFinite(calls) ? `≥ ${calls}` : "?"} calls; natural: see details.classify.calls in the JSON). Sluice: model.classify(text); natural: classifier.classify(text); sklearn: pipeline.predict([text]) on an evenly spread sample in Python (batch predict per text is in the ratios).`,
    "Model bytes: Sluice = the model file; natural = UTF-8 bytes of JSON.stringify(classifier), what its save() writes (it includes the stemmed training documents); sklearn = vocabulary (UTF-8 term bytes + 4 per index) + float64 coefficients and intercepts (one coefficient row for two classes; idf_, 8 bytes per term, is not counted: see details.idfBytes).",
    `Load ms: Sluice = loadModel(bytes), median of ${loadRepeats}; natural = JSON.parse + restore, median of up to ${loadRepeats} within 20 s; sklearn = pickle.loads of the fitted pipeline, median.`,
    `natural (8.1.1) runs in a child process killed at its training cap (BayesClassifier ${capOf("natural-bayes")} s, LogisticRegressionClassifier ${capOf("natural-logistic")} s, so that the whole comparison ends in about half an hour on 2 cores), with its default Porter stemmer and stop words. When the Bayes classifier hits its cap it is run again on an evenly spread subset of the training split.`,
  ];
}

/**
 * The table, the notes and the ratios, as the markdown that is printed and saved.
 * @example console.log(formatComparison(await runComparison()));
 */
export function formatComparison(rows: readonly ComparisonRow[]): string {
  return [comparisonTable(rows), "", ...comparisonNotes(rows).map((note) => `- ${note}`), "", "Ratios (same run):", "", "```", ...comparisonRatios(rows), "```", ""].join("\n");
}
