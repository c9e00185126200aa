// A small model for the report tests, built in memory: three labels whose names are HTML
// (so escaping is exercised everywhere a label appears), texts that carry markup, and a few
// deliberately mislabelled examples so the report has mistakes, curves and intervals to draw.

import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import type { Model } from "../../../runtime/model/model.ts";
import type { ReportExample } from "../../../compiler/report/report-data.ts";

/** A label that would run script if the report printed it raw. */
export const SCRIPT_LABEL = '<script>alert("label")</script>';
/** A label with the other characters HTML treats specially. */
export const AMPERSAND_LABEL = `fees & "refunds" 'now'`;
export const PLAIN_LABEL = "shipping";
/** Markup inside texts; the mislabelled examples carry it, so it shows among the confident mistakes. */
export const TEXT_PAYLOAD = '<img src=x onerror="alert(1)">';
export const TRAINING_SHA256 = "ab".repeat(32);

const WORDS: Record<string, string[]> = {
  [SCRIPT_LABEL]: ["prize", "winner", "claim", "free", "offer", "click", "bonus", "lottery"],
  [AMPERSAND_LABEL]: ["invoice", "charge", "refund", "card", "payment", "billing", "fee", "receipt"],
  [PLAIN_LABEL]: ["parcel", "courier", "delivery", "tracking", "package", "shipped", "arrive", "late"],
};
const SHARED = ["please", "today", "order", "hello", "thanks", "account"];

/** Deterministic labelled examples: `perLabel` per label, every 17th mislabelled and carrying markup. */
export function reportExamples(perLabel = 60): ReportExample[] {
  const labels = Object.keys(WORDS);
  const examples: ReportExample[] = [];
  let state = 12345;
  const next = () => {
    // Park–Miller minimal standard generator (Park & Miller, CACM 31(10), 1988): a fixed,
    // seedable sequence so the data is the same on every run.
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
  for (let i = 0; i < perLabel * labels.length; i++) {
    const label = labels[i % labels.length];
    const own = WORDS[label];
    const words: string[] = [];
    for (let w = 0; w < 6; w++) words.push(next() < 0.7 ? own[Math.floor(next() * own.length)] : SHARED[Math.floor(next() * SHARED.length)]);
    // One word of another label in a quarter of the texts keeps scores away from 0 and 1.
    if (next() < 0.25) {
      const other = labels[(i + 1) % labels.length];
      words.push(WORDS[other][Math.floor(next() * WORDS[other].length)]);
    }
    const mislabelled = i % 17 === 5;
    const text = mislabelled ? `${words.join(" ")} ${TEXT_PAYLOAD}` : words.join(" ");
    examples.push({ text, labels: [mislabelled ? labels[(i + 2) % labels.length] : label], line: i + 1 });
  }
  return examples;
}

/** Builds the test model from `reportExamples()` with a block rule on SCRIPT_LABEL and a review floor. */
export async function buildReportModel(): Promise<{ model: Model; examples: ReportExample[] }> {
  const examples = reportExamples();
  const settings = {
    ...defaultBuildSettings(),
    dims: 8,
    hashBits: 14,
    charSpan: [0, 0] as [number, number],
    minDocs: 1,
    epochs: 15,
    searchTime: 0,
    holdout: 0.25,
    targetPrecision: { [SCRIPT_LABEL]: 0.8 },
    reviewBelow: 0.5,
  };
  const { bytes } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z", dataSha256: TRAINING_SHA256, dataName: "<b>train</b>.jsonl" });
  return { model: loadModel(bytes), examples };
}
