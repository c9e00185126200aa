// The traffic report: what the Worker's review loop counted (GET /v1/stats, GET /v1/shadow)
// drawn against what the model saw on its validation split (stored in its metrics by the
// build), with a population-stability figure for the top labels and the top scores, and the
// shadow candidate's agreements and flips. Pure: JSON in, one self-contained page out.

import type { Model } from "../../runtime/model/model.ts";
import { populationStability, type PopulationStability } from "../metrics/population-stability.ts";
import { escapeHtml } from "./escape-html.ts";
import { htmlTable } from "./html-table.ts";
import { renderPairedBars } from "./paired-bar-chart.ts";
import { renderPage, type PageSection } from "./report-page.ts";
import { formatCount, formatPercent, shorten } from "./report-format.ts";

/** The parts of GET /v1/stats the report reads. */
export interface StatsExport {
  modelVersion: string;
  hours: { hour: number; modelVersion: string; actions: Record<string, number>; labels: Record<string, number>; topScores: Record<string, number> }[];
  isolate?: { reviewsLost?: number; writesFailed?: number } | null;
}

/** The parts of GET /v1/shadow the report reads. */
export interface ShadowExport {
  live: { version: string };
  candidate: { version: string } | null;
  total: number;
  agreements: number;
  flips: number;
  cells: { liveLabel: string; candidateLabel: string; liveAction: string; candidateAction: string; count: number }[];
  hours: { hour: number; total: number; flips: number }[];
  samples: { text: string; live: { label: string; action: string }; candidate: { label: string; action: string } }[];
}

const SCORE_BUCKETS = ["0.0", "0.1", "0.2", "0.3", "0.4", "0.5", "0.6", "0.7", "0.8", "0.9"];

function sum(into: Record<string, number>, from: Readonly<Record<string, number>>): void {
  for (const [key, count] of Object.entries(from)) into[key] = (into[key] ?? 0) + count;
}

/** Validation counts stored by the build (metrics.traffic), or null for older models. */
function validationCounts(model: Model): { labels: Record<string, number>; topScores: Record<string, number> } | null {
  const traffic = (model.meta.metrics as Record<string, unknown>).traffic as { labels?: Record<string, number>; topScores?: Record<string, number> } | undefined;
  if (traffic?.labels === undefined || traffic.topScores === undefined) return null;
  return { labels: traffic.labels, topScores: traffic.topScores };
}

function stabilityLine(name: string, stability: PopulationStability): string {
  if (stability.reading === "no data") return `<p>${escapeHtml(name)}: no data to compare.</p>`;
  return `<p class="stability"><strong>${escapeHtml(name)}: population stability ${stability.psi.toFixed(3)}</strong> (${stability.reading}; below 0.1 is little change, above 0.25 a large shift).</p>`;
}

function shares(counts: Readonly<Record<string, number>>, category: string): number {
  const total = Object.values(counts).reduce((a, b) => a + b, 0);
  return total === 0 ? 0 : (counts[category] ?? 0) / total;
}

function trafficSections(model: Model, stats: StatsExport): PageSection[] {
  const live = stats.hours.filter((h) => h.modelVersion === model.meta.version);
  const labels: Record<string, number> = {};
  const scores: Record<string, number> = {};
  const actions: Record<string, number> = {};
  for (const hour of live) {
    sum(labels, hour.labels);
    sum(scores, hour.topScores);
    sum(actions, hour.actions);
  }
  const requests = Object.values(actions).reduce((a, b) => a + b, 0);
  const validation = validationCounts(model);
  const sections: PageSection[] = [];
  let body = `<p>${formatCount(requests)} decisions by model ${escapeHtml(model.meta.version)} in ${live.length} hours of counts.</p>`;
  if (stats.isolate && (stats.isolate.reviewsLost ?? 0) > 0) body += `<p class="warning">The exporting isolate could not store ${formatCount(stats.isolate.reviewsLost ?? 0)} review items (${formatCount(stats.isolate.writesFailed ?? 0)} failed writes).</p>`;
  body += htmlTable({ caption: "decisions by action", headings: ["action", "decisions", "share"], rows: Object.entries(actions).sort().map(([action, n]) => [action, formatCount(n), formatPercent(n / Math.max(1, requests))]) });
  if (validation === null) {
    body += "<p>This model file holds no validation counts (it was built before they were stored), so traffic cannot be compared with validation.</p>";
  } else {
    const labelStability = populationStability(validation.labels, labels);
    const scoreStability = populationStability(validation.topScores, scores);
    body += stabilityLine("Top labels", labelStability);
    body += renderPairedBars({
      id: "traffic-labels",
      title: "Top label: validation split vs live traffic",
      description: `Share of texts whose top label is each label. Population stability ${labelStability.psi.toFixed(3)} (${labelStability.reading}).`,
      series: ["validation", "traffic"],
      rows: model.labels.map((label) => ({ category: label, first: shares(validation.labels, label), second: shares(labels, label) })),
    });
    body += stabilityLine("Top scores", scoreStability);
    body += renderPairedBars({
      id: "traffic-scores",
      title: "Top score: validation split vs live traffic",
      description: `Share of texts whose top score falls in each tenth of [0, 1]. Population stability ${scoreStability.psi.toFixed(3)} (${scoreStability.reading}). More traffic in low buckets means more uncertain texts, and more review.`,
      series: ["validation", "traffic"],
      rows: SCORE_BUCKETS.map((bucket) => ({ category: `${bucket}–${(Number(bucket) + 0.1).toFixed(1)}`, first: shares(validation.topScores, bucket), second: shares(scores, bucket) })),
    });
  }
  sections.push({ id: "traffic", heading: "Live traffic against validation", body });
  return sections;
}

function shadowSection(shadow: ShadowExport): PageSection {
  if (shadow.candidate === null) return { id: "shadow", heading: "Shadow candidate", body: "<p>No candidate model was bundled.</p>" };
  let body = `<p>Candidate ${escapeHtml(shadow.candidate.version)} scored ${formatCount(shadow.total)} requests beside live ${escapeHtml(shadow.live.version)}: it agreed on ${formatCount(shadow.agreements)} (${formatPercent(shadow.agreements / Math.max(1, shadow.total))}) and would have decided ${formatCount(shadow.flips)} differently.</p>`;
  const flips = shadow.cells.filter((c) => c.liveLabel !== c.candidateLabel || c.liveAction !== c.candidateAction);
  body += htmlTable({
    caption: "flips: where the candidate decides differently",
    headings: ["live label", "candidate label", "live action", "candidate action", "requests", "share of all"],
    rows: flips.map((c) => [c.liveLabel, c.candidateLabel, c.liveAction, c.candidateAction, formatCount(c.count), formatPercent(c.count / Math.max(1, shadow.total))]),
    rowHeadings: false,
  });
  const byAction = new Map<string, number>();
  for (const c of flips) byAction.set(`${c.liveAction} → ${c.candidateAction}`, (byAction.get(`${c.liveAction} → ${c.candidateAction}`) ?? 0) + c.count);
  body += renderPairedBars({
    id: "shadow-actions",
    title: "Action changes the candidate would make",
    description: "Share of all shadowed requests for each change of action (first bar) and how many of those also change the label (second bar is the same share counted by action only, for scale).",
    series: ["share of requests", "share of flips"],
    rows: [...byAction.entries()].map(([change, n]) => ({ category: change, first: n / Math.max(1, shadow.total), second: n / Math.max(1, shadow.flips) })),
  });
  if (shadow.samples.length > 0) {
    body += htmlTable({
      caption: "sampled flipped texts (only kept with REVIEW_STORE_TEXT on)",
      headings: ["text", "live", "candidate"],
      rows: shadow.samples.slice(0, 20).map((s) => [shorten(s.text, 200), `${s.live.label} / ${s.live.action}`, `${s.candidate.label} / ${s.candidate.action}`]),
      rowHeadings: false,
    });
  }
  body += "<p>Promote by making the candidate the live model file and deploying; measure it on labelled data (<code>sluice compare</code>) first.</p>";
  return { id: "shadow", heading: "Shadow candidate", body };
}

/**
 * The whole page.
 * @example renderTrafficReport(model, statsJson, shadowJson, new Date().toISOString())
 */
export function renderTrafficReport(model: Model, stats: StatsExport | null, shadow: ShadowExport | null, generatedAt: string): string {
  const sections = [...(stats !== null ? trafficSections(model, stats) : []), ...(shadow !== null ? [shadowSection(shadow)] : [])];
  return renderPage({
    title: `Sluice traffic report: ${model.meta.version}`,
    lede: "What the deployed Worker counted, beside what the model saw when it was built.",
    introduction: "<p>Counts only: the Worker keeps no text for these figures. A drifting mix of labels or scores is a reason to review more traffic and rebuild, not proof that accuracy fell.</p>",
    sections,
    footer: `Generated ${generatedAt} by sluice traffic-report.`,
  });
}
