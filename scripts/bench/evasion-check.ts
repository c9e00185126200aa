// The evasion suite's twin on the training side, where the folding rules are chosen: the
// training part of each data set of `npm run bench:evasion` is split again (a fixed 20% of
// its groups by sha256, a salt of its own), a default build with folding learns from the rest,
// and the held-back rows are perturbed by each kind of evasion-perturb.ts with several seeds.
// It prints accuracy and the policy labels' recall at their thresholds, clean and perturbed
// (the mean over the seeds, and the spread), and with --show KIND the texts a perturbation
// lost, with their folded tokens, so a rule can be judged on why it loses them. The bench's
// test parts are never read here: they report, this decides.
//
//   node --import tsx scripts/bench/evasion-check.ts [--corpora DIR] [--only contact-form,mail-spam,catalog-languages]
//     [--rate 0.3] [--seeds 5] [--show spacing] [--no-fold] [--build-seed N] [--read-as N] [--char-span 1-4] [--show-top-others]
//
// Measurements, not tests.
import { existsSync } from "node:fs";
import { join, resolve } from "node:path";
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { createFeatureBuffer, createFeaturizer, loadModel, type Model } from "../../runtime/index.ts";
import { CONTACT_FORM_TARGETS, MAIL_SPAM_TARGETS, contactFormRows, corpusRows, hashShare, inContactFormTestPart, type Row } from "./evasion-data.ts";
import { PERTURBATION_KINDS, perturbText, seedOf, type PerturbationKind } from "./evasion-perturb.ts";

function option(name: string): string | undefined {
  const index = process.argv.indexOf(name);
  return index === -1 ? undefined : process.argv[index + 1];
}

/** The training parts the bench trains on (its test parts are left out here, exactly as there). */
function trainingParts(corporaRoot: string): { name: string; rows: Row[]; targets: { precision: Record<string, number>; recall: Record<string, number> } }[] {
  const out = [];
  const spamTrain = join(corporaRoot, "mail-spam", "train.jsonl");
  if (existsSync(spamTrain)) {
    out.push({ name: "mail-spam", rows: corpusRows(spamTrain), targets: MAIL_SPAM_TARGETS });
  }
  const contact = contactFormRows().filter((r) => !inContactFormTestPart(r.group)); // the bench's training part
  out.push({ name: "contact-form", rows: contact, targets: CONTACT_FORM_TARGETS });
  // Any other single-label corpus of the suite named in --only: its training part, no policy
  // (what a folding rule costs clean text elsewhere, e.g. language identification).
  for (const name of option("--only")?.split(",") ?? []) {
    const file = join(corporaRoot, name, "train.jsonl");
    if (name === "mail-spam" || name === "contact-form" || !existsSync(file)) continue;
    out.push({ name, rows: corpusRows(file), targets: { precision: {}, recall: {} } });
  }
  return out;
}

function flaggedOf(model: Model, texts: string[], thresholds: Record<string, number>): { predictions: string[]; flagged: Record<string, boolean[]> } {
  const predictions: string[] = [];
  const flagged: Record<string, boolean[]> = Object.fromEntries(Object.keys(thresholds).map((l) => [l, []]));
  for (const text of texts) {
    const scores = model.classify(text, { top: model.labels.length });
    predictions.push(scores[0].label);
    for (const [label, threshold] of Object.entries(thresholds)) flagged[label].push((scores.find((s) => s.label === label)?.score ?? 0) >= threshold);
  }
  return { predictions, flagged };
}

function tokensOf(model: Model, text: string): string {
  const buffer = createFeatureBuffer(256, "origins");
  model.featurizer.featurize(text, buffer);
  const tokens = model.featurizer.tokens;
  const names = tokens.tokenNames.slice(0, tokens.tokenTotal);
  const extras = tokens.extraNames.slice(0, tokens.extraTotal);
  return `${names.join(" ")}${extras.length > 0 ? `  [extra: ${extras.join(" ")}]` : ""}`;
}

/** The features whose contributions to `label`'s logit differ most between two readings. */
function driftOf(model: Model, label: string, clean: string, perturbed: string): string {
  const contributions = (text: string) => {
    const explained = model.explain(text, { top: model.labels.length, features: 100000 }).labels.find((e) => e.label === label);
    return { logit: explained?.logit ?? 0, byName: new Map((explained?.features ?? []).map((f) => [f.feature, f.contribution])) };
  };
  const a = contributions(clean);
  const b = contributions(perturbed);
  const names = new Set([...a.byName.keys(), ...b.byName.keys()]);
  const deltas = [...names].map((n) => [n, (b.byName.get(n) ?? 0) - (a.byName.get(n) ?? 0)] as const).sort((x, y) => Math.abs(y[1]) - Math.abs(x[1]));
  return `logit ${a.logit.toFixed(2)} -> ${b.logit.toFixed(2)}; drift: ${deltas.slice(0, 12).map(([n, d]) => `${n} ${d >= 0 ? "+" : ""}${d.toFixed(2)}`).join(", ")}`;
}

const only = option("--only")?.split(",") ?? null;
const rate = Number(option("--rate") ?? "0.3");
const seedCount = Number(option("--seeds") ?? "5");
const show = option("--show") as PerturbationKind | undefined;
const fold = !process.argv.includes("--no-fold");
for (const part of trainingParts(resolve(option("--corpora") ?? "corpora"))) {
  if (only !== null && !only.includes(part.name)) continue;
  const fit = part.rows.filter((r) => hashShare("sluice-evasion-check-v1", r.group) >= 0.2);
  const check = part.rows.filter((r) => hashShare("sluice-evasion-check-v1", r.group) < 0.2);
  const seed = Number(option("--build-seed") ?? defaultBuildSettings().seed);
  const charSpan = (option("--char-span") ?? "0-0").split("-").map(Number) as [number, number];
  const settings = { ...defaultBuildSettings(), seed, charSpan, searchTime: 0, foldEvasion: fold, targetPrecision: part.targets.precision, targetRecall: part.targets.recall };
  const { bytes } = await build({ examples: fit.map((r) => ({ text: r.text, labels: [r.label], group: r.group })), settings, buildTime: "2026-01-01T00:00:00.000Z", dataName: part.name });
  const model = loadModel(bytes);
  // --read-as N: score the same model with another normalization's reading (an A/B of the
  // serving-side rules on one trained model; the texts it trained on rarely hold the spellings
  // those rules read, so this isolates what the reading does from what retraining swings).
  const readAs = option("--read-as");
  if (readAs !== undefined) (model as unknown as { featurizer: unknown }).featurizer = createFeaturizer({ ...model.parts.header.featurizer, normalization: Number(readAs) });
  const thresholds = Object.fromEntries((model.parts.header.policy?.rules ?? []).map((rule) => [rule.label, rule.threshold]));
  const labels = Object.keys(thresholds);
  const score = (texts: string[]) => {
    const { predictions, flagged } = flaggedOf(model, texts, thresholds);
    const accuracy = predictions.filter((p, i) => p === check[i].label).length / check.length;
    const recall = Object.fromEntries(labels.map((l) => {
      const positives = check.map((r, i) => (r.label === l ? i : -1)).filter((i) => i >= 0);
      return [l, positives.filter((i) => flagged[l][i]).length / Math.max(1, positives.length)];
    }));
    return { accuracy, recall, flagged, spamScores: texts.map((t) => model.classify(t, { top: model.labels.length }).find((s) => s.label === "spam")?.score ?? 0) };
  };
  const clean = score(check.map((r) => r.text));
  if (process.argv.includes("--show-top-others")) {
    // The check part's texts not labelled spam that score highest as spam: what sets a 99%-precision threshold.
    const others = check.map((r, i) => ({ r, s: clean.spamScores[i] })).filter((x) => x.r.label !== "spam").sort((a, b) => b.s - a.s).slice(0, 8);
    for (const { r, s } of others) console.log(`    ${s.toFixed(5)} [${r.label}] ${r.text.slice(0, 160).replace(/\s+/g, " ")}`);
  }
  // Fixed operating points besides the policy's (whose threshold, at 99% precision on a small
  // validation part, swings from build to build): the spam scores that 25% and 50% of the clean
  // check part's spam reach. Perturbed recall at the same scores shows how far the texts moved.
  const spamIndexes = check.map((r, i) => (r.label === "spam" ? i : -1)).filter((i) => i >= 0);
  if (spamIndexes.length === 0) spamIndexes.push(0); // no spam label: the fixed-score columns mean nothing there
  const cleanSpamScores = spamIndexes.map((i) => clean.spamScores[i]).sort((a, b) => b - a);
  const fixedPoints = [0.25, 0.5].map((q) => cleanSpamScores[Math.floor(q * cleanSpamScores.length)]);
  const recallAt = (scores: number[], threshold: number) => spamIndexes.filter((i) => scores[i] > threshold).length / spamIndexes.length;
  const positives = Object.fromEntries(labels.map((l) => [l, check.filter((r) => r.label === l).length]));
  console.log(`${part.name}: fit ${fit.length}, check ${check.length} rows (${labels.map((l) => `${positives[l]} ${l}`).join(", ")}); ${bytes.length} bytes; normalization ${model.featurizer.settings.normalization}; thresholds ${JSON.stringify(thresholds)}`);
  console.log(`  clean: accuracy ${(clean.accuracy * 100).toFixed(2)}%, ${labels.map((l) => `${l} recall ${(clean.recall[l] * 100).toFixed(2)}%`).join(", ")}`);
  for (const kind of PERTURBATION_KINDS) {
    const drops: Record<string, number[]> = Object.fromEntries(labels.map((l) => [l, []]));
    const accuracies: number[] = [];
    const fixedDrops: number[][] = fixedPoints.map(() => []);
    for (let seed = 0; seed < seedCount; seed++) {
      const texts = check.map((r, i) => perturbText(r.text, kind, rate, seedOf(`check:${kind}:${rate}:${seed}:${i}`)));
      const cell = score(texts);
      accuracies.push(cell.accuracy);
      for (const l of labels) drops[l].push(cell.recall[l] - clean.recall[l]);
      fixedPoints.forEach((threshold, k) => fixedDrops[k].push(recallAt(cell.spamScores, threshold) - recallAt(clean.spamScores, threshold)));
      if (show === kind && seed === 0) {
        for (const l of labels) {
          check.forEach((r, i) => {
            if (r.label !== l || !clean.flagged[l][i] || cell.flagged[l][i]) return;
            console.log(`    lost ${l} #${i}:\n      clean:     ${r.text}\n      perturbed: ${texts[i]}\n      tokens:    ${tokensOf(model, texts[i])}\n      clean tok: ${tokensOf(model, r.text)}\n      ${driftOf(model, l, r.text, texts[i])}`);
          });
        }
      }
    }
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    const range = (xs: number[]) => `${(Math.min(...xs) * 100).toFixed(1)}..${(Math.max(...xs) * 100).toFixed(1)}`;
    console.log(`  ${kind.padEnd(11)} ${Math.round(rate * 100)}%: accuracy ${(mean(accuracies) * 100).toFixed(2)}%, ${labels.map((l) => `${l} recall ${((clean.recall[l] + mean(drops[l])) * 100).toFixed(2)}% (${mean(drops[l]) >= 0 ? "+" : ""}${(mean(drops[l]) * 100).toFixed(2)}, seeds ${range(drops[l])})`).join(", ")}; spam at fixed scores ${fixedPoints.map((_, k) => `${mean(fixedDrops[k]) >= 0 ? "+" : ""}${(mean(fixedDrops[k]) * 100).toFixed(2)}`).join(" / ")}`);
  }
}
