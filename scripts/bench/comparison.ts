// The side-by-side part of `npm run bench`: Sluice against the general-purpose JS NLP
// library `natural` (its naive Bayes and logistic regression classifiers) and against
// scikit-learn's TF-IDF + logistic regression, the strong linear reference, on the same
// train/test splits of two datasets. Every system's accuracy and macro-F1 come from its own
// predictions on the test split, scored by the same code (compiler/metrics); every JS
// system's classify time is measured by the same single-call loop (timeSingleCalls).
//
//   node --import tsx scripts/bench/comparison.ts [--quick] [--write]
//
// prints the table and the ratios; --write also saves test/bench/results/comparison.{json,md}.
// Nothing heavy should run at the same time: the numbers are wall-clock timings.

import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { formatComparison } from "./comparison-print.ts";
import { loadDatasets, planFor, writeJsonl, type ComparisonRow } from "./comparison-rows.ts";
import { naturalRows } from "./comparison-natural.ts";
import { sklearnRow } from "./comparison-sklearn.ts";
import { sluiceRow, sluiceRows } from "./comparison-sluice.ts";
import { writeResults } from "./results-writer.ts";

/**
 * Builds, trains and measures every system on both datasets, one after another.
 * `quick` shortens caps and call counts and skips the 2-thread builds (a smoke run).
 * @example const rows = await runComparison(); console.log(formatComparison(rows));
 */
export async function runComparison(options: { quick?: boolean; log?: (line: string) => void } = {}): Promise<ComparisonRow[]> {
  const plan = planFor(options.quick ?? false);
  const log = options.log ?? ((line: string) => process.stderr.write(`${line}\n`));
  const rows: ComparisonRow[] = [];
  for (const dataset of await loadDatasets()) {
    log(`${dataset.name}: ${dataset.train.length} train / ${dataset.test.length} test examples`);
    const directory = mkdtempSync(join(tmpdir(), "sluice-comparison-"));
    try {
      writeJsonl(join(directory, "train.jsonl"), dataset.train);
      writeJsonl(join(directory, "test.jsonl"), dataset.test);
      rows.push(...(await sluiceRows(dataset, plan, log)));
      const sklearn = sklearnRow(dataset, plan, directory, log);
      rows.push(sklearn);
      if (sklearn.status === "ok" && sklearn.modelBytes !== null) {
        // The size target: a compiled model at most 1/20 of the reference's bytes. Such a budget
        // is too small for the ~1 byte per training text of the leakage fingerprint, so it is left out.
        const maxBytes = Math.floor(sklearn.modelBytes / 20);
        log(`  Sluice compiled, --max-bytes ${maxBytes} (1/20 of scikit-learn's), --no-fingerprint`);
        rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8, max-bytes ${maxBytes} = sklearn/20, no fingerprint (1 thread)`, "sluice-twentieth", { ...defaultBuildSettings(), threads: 1, maxBytes, fingerprint: false }));
      }
      rows.push(...(await naturalRows(dataset, plan, directory, log)));
    } finally {
      rmSync(directory, { recursive: true, force: true });
    }
  }
  return rows;
}

async function main(argv: readonly string[]): Promise<void> {
  const unknown = argv.filter((a) => a !== "--quick" && a !== "--write");
  if (unknown.length > 0) throw new Error(`comparison.ts: unknown argument ${unknown.join(" ")}; expected --quick and/or --write`);
  const rows = await runComparison({ quick: argv.includes("--quick") });
  const markdown = formatComparison(rows);
  process.stdout.write(markdown);
  if (argv.includes("--write")) {
    const written = writeResults("comparison", rows, markdown);
    process.stderr.write(`wrote ${written.json} and ${written.markdown}\n`);
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    process.stderr.write(`${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    process.exit(1);
  });
}
