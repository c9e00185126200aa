// What the EMAIL_MIN_SCORE default (0.7, runtime/worker/app-config.ts, wrangler.toml,
// runtime/worker/README.md) is for, checked as rules rather than as the measured shares: on the
// demo routing model's own validation split (the 600 support e-mails its build held out,
// labelled in demo-data/support-topics.csv, about 3% wrong on purpose, demo-data/README.md),
// and on support mails written and labelled by hand.

import { beforeAll, describe, expect, it } from "vitest";
import { readExamples } from "../../compiler/read/index.ts";
import type { Example } from "../../compiler/read/read-types.ts";
import { findClusters, groupedSplit } from "../../compiler/train/group-split.ts";
import type { Model } from "../../runtime/model/model.ts";
import { DEFAULT_APP_CONFIG } from "../../runtime/worker/app-config.ts";
import { DEMO_ROUTING_MODEL_ARGS } from "../../scripts/demo-model.ts";
import { HAND_LABELLED_SUPPORT_MAIL } from "./helpers/hand-labelled-mail.ts";
import { demoModel, routingModel } from "./helpers/worker-fixture.ts";

const MIN_SCORE = DEFAULT_APP_CONFIG.email.minScore;

let routing: Model;
let validation: Example[];

beforeAll(async () => {
  routing = routingModel();
  const examples: Example[] = [];
  for await (const example of readExamples(new URL("../../demo-data/support-topics.csv", import.meta.url).pathname, { textFields: ["subject", "body"], labelField: "topic" })) examples.push(example);
  // The build's own split: stratified, 10% held out, seed 1, as the recipe asks.
  expect(DEMO_ROUTING_MODEL_ARGS).not.toContain("--holdout");
  expect(DEMO_ROUTING_MODEL_ARGS).not.toContain("--seed");
  const labels = [...new Set(examples.map((example) => example.labels[0]))].sort();
  // The recipe splits near-identical texts like other rows (--near-duplicates apart).
  expect(DEMO_ROUTING_MODEL_ARGS).toContain("apart");
  const split = groupedSplit(examples.map((example) => labels.indexOf(example.labels[0])), findClusters(examples, { nearDuplicates: false }), 0.1, 1);
  validation = Array.from(split.validation, (index) => examples[index]);
});

/** Agreement with the labelled topic of the validation mail whose top score is at least `from` and below `to`. */
function agreement(from: number, to = Infinity): { count: number; accuracy: number } {
  let count = 0;
  let right = 0;
  for (const example of validation) {
    const [top] = routing.classify(example.text, { top: 1 });
    if (top.score < from || top.score >= to) continue;
    count++;
    if (top.label === example.labels[0]) right++;
  }
  return { count, accuracy: right / count };
}

describe("the EMAIL_MIN_SCORE default", () => {
  it("is measured on the split the routing model was validated on", () => {
    expect(validation).toHaveLength((routing.meta.metrics as { validationExamples: number }).validationExamples);
    // With no threshold the accuracy is the build's own validation figure, so the split is the same.
    expect(agreement(0).accuracy).toBeCloseTo((routing.meta.metrics as { compiled: { accuracy: number } }).compiled.accuracy, 5);
  });

  // The stated reason for the threshold (runtime/worker/README.md, "Choosing EMAIL_MIN_SCORE"):
  // it sends the vaguest mail to a person. So the mail it holds back must be the less reliable
  // part, and the mail it routes no less reliable than routing everything. The README's table
  // gives the measured shares; they are measurements, not pinned here.
  it("holds back the less reliable mail: below it the top topic agrees with the label less often than above it", () => {
    expect(MIN_SCORE).toBe(0.7);
    const above = agreement(MIN_SCORE);
    const below = agreement(0, MIN_SCORE);
    expect(above.count).toBeGreaterThan(0);
    expect(below.count).toBeGreaterThan(0);
    expect(below.accuracy).toBeLessThan(above.accuracy);
    expect(above.accuracy).toBeGreaterThanOrEqual(agreement(0).accuracy);
  });

  // Known answers: support mails written by hand, each about one topic (helpers/hand-labelled-mail.ts).
  it("routes every hand-labelled single-topic mail to its own team, above the threshold", () => {
    for (const { topic, text } of HAND_LABELLED_SUPPORT_MAIL) {
      const [top] = routing.classify(text, { top: 1 });
      expect({ text, label: top.label, routed: top.score >= MIN_SCORE }).toEqual({ text, label: topic, routed: true });
    }
  });

  // With no known feature the score is the model's prior (runtime/model/model.ts), which a
  // model fitted by cross-entropy puts near the label frequencies (common practice, no source):
  // at most 25% here (shipping, 1473 of 6000, demo-data/README.md), far below 0.7. So mail the
  // model cannot read goes to a person.
  it("sends mail of words the model has never seen to the fallback", () => {
    const result = routing.score("Zorvik plenthar\n\nQuandrel vospith mirrokan telbu.");
    expect(result.knownFeatures).toBe(0);
    expect(Math.max(...result.scores)).toBeLessThan(MIN_SCORE);
  });

  // Moderation sits in front of routing, and a false positive there silences a real person
  // (README, "Before you moderate anything": spam is blocked only above a 95%-precision
  // threshold, abuse and doubt go to review). Support mail is neither spam nor abuse, so none
  // may be refused; review is allowed (a person then reads it).
  it("refuses none of the validation mail or the hand-labelled mail once moderation is in front", () => {
    const moderation = demoModel();
    // The e-mail handler reads "subject, blank line, body"; the data joins the fields with one line break.
    const texts = [...validation.map((example) => example.text.replace("\n", "\n\n")), ...HAND_LABELLED_SUPPORT_MAIL.map((mail) => mail.text)];
    const refused = texts.filter((text) => moderation.decide(text).action === "block");
    expect(refused).toEqual([]);
  });
});
