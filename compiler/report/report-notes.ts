// The plain-language parts of the report: warnings about how far its numbers can be trusted,
// and the note on what automatic decisions can do to legitimate users.

import { escapeHtml } from "./escape-html.ts";
import { countOf } from "./report-format.ts";

export interface ReportCaveats {
  /** SHA-256 of the report's data equals the model's training-data SHA-256. */
  sameAsTrainingData: boolean;
  unknownLabelExamples: number;
  unknownLabels: string[];
  scoredExamples: number;
  /** Labels with no example in the data (their recall and curves are empty). */
  labelsWithoutExamples: string[];
}

/**
 * Warnings that change how the numbers should be read; empty string when there are none.
 * @example renderCaveats({ sameAsTrainingData: true, unknownLabelExamples: 0, unknownLabels: [], scoredExamples: 10, labelsWithoutExamples: [] })
 */
export function renderCaveats(caveats: ReportCaveats): string {
  const items: string[] = [];
  if (caveats.sameAsTrainingData) {
    items.push("This is the file the model was built from (same SHA-256). Most of its examples were used for training, so these numbers overstate how the model does on new text. Measure on data held out from training.");
  }
  if (caveats.scoredExamples === 0) items.push("No example has a label the model knows, so there is nothing to measure.");
  if (caveats.unknownLabelExamples > 0) {
    items.push(`${countOf(caveats.unknownLabelExamples, "example")} ${caveats.unknownLabelExamples === 1 ? "has a label" : "have labels"} the model does not know (${caveats.unknownLabels.slice(0, 8).join(", ")}${caveats.unknownLabels.length > 8 ? ", …" : ""}); they are left out of every number below.`);
  }
  if (caveats.labelsWithoutExamples.length > 0) {
    items.push(`No example carries ${caveats.labelsWithoutExamples.slice(0, 8).join(", ")}${caveats.labelsWithoutExamples.length > 8 ? ", …" : ""}: recall and curves of these labels cannot be measured here.`);
  }
  if (items.length === 0) return "";
  return `<div class="caveats" role="note"><h2 id="caveats">Read these numbers with care</h2><ul>${items.map((item) => `<li>${escapeHtml(item)}</li>`).join("")}</ul></div>`;
}

/**
 * The responsible-use note: automatic blocking can hurt legitimate users.
 * @example renderResponsibleUseNote()
 */
export function renderResponsibleUseNote(): string {
  return [
    "<p>A classifier makes mistakes, and a blocked message is a person who was not heard. Automatic blocking can hurt legitimate users: people who write in another dialect or language, use unusual words, or write about hard subjects are often the ones flagged wrongly.</p>",
    "<ul>",
    "<li><strong>Keep a review band.</strong> Send uncertain scores to a person instead of deciding automatically, and block only at thresholds whose precision you have measured.</li>",
    "<li><strong>Measure false positives on your own data.</strong> The numbers in this report hold for the data it was given; texts from your users may differ. Re-measure whenever your traffic or the model changes.</li>",
    "<li><strong>Follow your own policies and local law.</strong> Rules on automated decisions, appeals, records and data protection differ between places; give people a way to appeal.</li>",
    "</ul>",
  ].join("");
}
