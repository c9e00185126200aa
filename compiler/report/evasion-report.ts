// The evasion report (`sluice report --evasion test/bench/results/evasion.json`): what the
// evasion suite (scripts/bench/evasion.ts) measured, as one self-contained page. Per data set
// one chart, the recall of the first policy label at its threshold on each perturbation kind
// at one rate, for every system side by side, and one table with every cell. Pure: results in,
// page out.

import { escapeHtml } from "./escape-html.ts";
import { chartDataTable, htmlTable } from "./html-table.ts";
import { OKABE_ITO } from "./report-palettes.ts";
import { renderPage, type PageSection } from "./report-page.ts";
import { element, linearScale, svgChart, svgText } from "./svg-builder.ts";

/** The parts of test/bench/results/evasion.json the page reads (its `data` field). */
export interface EvasionResultsFile {
  date: string;
  machine: string;
  versions: Record<string, string>;
  command: string;
  rates: number[];
  datasets: { name: string; description: string; trainRows: number; testRows: number; targets: { label: string; precision?: number; recall?: number }[]; modelBytes: Record<string, number> }[];
  cells: { dataset: string; system: string; kind: string; rate: number; accuracy: number; recall: Record<string, number> }[];
  notes: string[];
}

const COLOURS = [OKABE_ITO.blue, OKABE_ITO.vermillion, OKABE_ITO.bluishGreen, OKABE_ITO.reddishPurple, OKABE_ITO.black];
const PATTERNS = ["", "4 2", "1 2", "6 2 1 2", ""];
const WIDTH = 760;
const LEFT = 130;
const TOP = 46;

function percent(value: number | undefined): string {
  return value === undefined || !Number.isFinite(value) ? "n/a" : `${(value * 100).toFixed(1)}%`;
}

function points(value: number): string {
  if (!Number.isFinite(value)) return "n/a";
  const p = value * 100;
  return `${p >= 0 ? "+" : "−"}${Math.abs(p).toFixed(1)}`;
}

/** The rate the chart shows: 30% when measured (the issue's target), else the middle one. */
function chartRate(rates: number[]): number {
  return rates.includes(0.3) ? 0.3 : rates[Math.floor(rates.length / 2)];
}

function groupedBars(id: string, title: string, description: string, systems: string[], categories: string[], value: (system: string, category: string) => number | undefined): string {
  const barHeight = 10;
  const row = systems.length * (barHeight + 2) + 12;
  const height = TOP + categories.length * row + 24;
  const x = linearScale([0, 1], [LEFT, WIDTH - 60]);
  const parts: string[] = [];
  systems.forEach((system, s) => {
    const lx = LEFT + (s % 2) * 300;
    const ly = 8 + Math.floor(s / 2) * 16;
    parts.push(element("rect", { x: lx, y: ly, width: 12, height: 10, fill: COLOURS[s % COLOURS.length], stroke: "#000", "stroke-width": 0.5, "stroke-dasharray": PATTERNS[s % PATTERNS.length] }));
    parts.push(svgText(lx + 18, ly + 9, system, { class: "annotation" }));
  });
  categories.forEach((category, c) => {
    const y = TOP + c * row;
    parts.push(svgText(LEFT - 8, y + row / 2, category, { "text-anchor": "end", class: "label" }));
    systems.forEach((system, s) => {
      const v = value(system, category);
      const barY = y + s * (barHeight + 2);
      if (v === undefined) return;
      parts.push(element("rect", { x: LEFT, y: barY, width: Math.max(1, x(v) - LEFT), height: barHeight, fill: COLOURS[s % COLOURS.length], stroke: "#000", "stroke-width": 0.5, "stroke-dasharray": PATTERNS[s % PATTERNS.length] }));
      parts.push(svgText(x(v) + 4, barY + 9, percent(v), { class: "bar-value" }));
    });
  });
  parts.push(element("line", { x1: LEFT, y1: TOP - 4, x2: LEFT, y2: height - 20, stroke: "#000" }));
  const svg = svgChart({ id, width: WIDTH, height, title, description }, parts.join(""));
  const table = chartDataTable({ caption: title, headings: ["perturbation", ...systems], rows: categories.map((category) => [category, ...systems.map((system) => percent(value(system, category)))]) });
  return `<figure class="chart-figure">${svg}<figcaption>${escapeHtml(description)}</figcaption>${table}</figure>`;
}

function datasetSection(results: EvasionResultsFile, set: EvasionResultsFile["datasets"][number]): PageSection {
  const cells = results.cells.filter((cell) => cell.dataset === set.name);
  const systems = [...new Set(cells.map((cell) => cell.system))];
  const labels = set.targets.map((target) => target.label);
  const first = labels[0];
  const rate = chartRate(results.rates);
  const kinds = ["clean", ...new Set(cells.filter((cell) => cell.kind !== "clean").map((cell) => cell.kind))];
  const find = (system: string, kind: string, at: number) => cells.find((cell) => cell.system === system && cell.kind === kind && (kind === "clean" || cell.rate === at));
  const targets = set.targets.map((t) => (t.precision !== undefined ? `${t.label}: the lowest threshold reaching ${t.precision * 100}% precision` : `${t.label}: the highest threshold reaching ${(t.recall ?? 0) * 100}% recall`)).join("; ");
  let body = `<p>${escapeHtml(set.description)}: ${set.trainRows} training rows (clean), ${set.testRows} test rows, each perturbed copy of the test part scored by every system. Policy thresholds, chosen on validation data carved from training: ${escapeHtml(targets)}. Model bytes: ${escapeHtml(Object.entries(set.modelBytes).map(([system, bytes]) => `${system} ${bytes}`).join(", "))}.</p>`;
  body += groupedBars(
    `evasion-${set.name}`,
    `${set.name}: ${first} recall at its policy threshold, ${Math.round(rate * 100)}% of words perturbed`,
    `Share of the test part's ${first} texts that reach the ${first} threshold, on the clean test part and on each perturbation kind with ${Math.round(rate * 100)}% of words rewritten, for each system.`,
    systems,
    kinds,
    (system, kind) => find(system, kind, rate)?.recall[first],
  );
  const rows = cells.map((cell) => {
    const clean = find(cell.system, "clean", 0);
    return [
      cell.system,
      cell.kind === "clean" ? "clean" : `${cell.kind}, ${Math.round(cell.rate * 100)}%`,
      percent(cell.accuracy),
      ...labels.map((label) => (cell.kind === "clean" || !clean ? percent(cell.recall[label]) : `${percent(cell.recall[label])} (${points(cell.recall[label] - clean.recall[label])})`)),
    ];
  });
  body += htmlTable({ caption: `${set.name}: every system on every perturbed test part`, headings: ["system", "test part", "accuracy", ...labels.map((label) => `${label} recall (points vs clean)`)], rows, rowHeadings: false, numericColumns: [2, ...labels.map((_, i) => 3 + i)] });
  return { id: `evasion-${set.name}`, heading: set.name, body };
}

/**
 * The whole page.
 * @example renderEvasionReport(JSON.parse(readFileSync("test/bench/results/evasion.json", "utf8")).data, new Date().toISOString())
 */
export function renderEvasionReport(results: EvasionResultsFile, generatedAt: string): string {
  const versions = Object.entries(results.versions).map(([name, version]) => `${name} ${version}`).join(", ");
  const notes = results.notes.length > 0 ? `<ul>${results.notes.map((note) => `<li>${escapeHtml(note)}</li>`).join("")}</ul>` : "";
  return renderPage({
    title: "Sluice evasion report",
    lede: `Measured ${results.date} on ${results.machine}; ${versions}. Command: ${results.command}.`,
    introduction:
      "<p>Models are trained on clean text; the test part is then rewritten the way evaders write (lookalike letters, leetspeak, spaced, dotted, stretched and padded words, invisible characters, all mixed), with a seeded share of its words affected. A recall that holds means the policy still catches what it caught on clean text. Every text in the test part is rewritten, legitimate ones too, so accuracy also shows how often an evasive-looking legitimate text is misread.</p>" +
      "<p>These are measurements on two data sets, not guarantees: evaders adapt, and a blocked legitimate message hurts a person. Keep the human-review band, and apply the operator's own policies and local law.</p>" +
      notes,
    sections: results.datasets.map((set) => datasetSection(results, set)),
    footer: `Generated ${generatedAt} by sluice report --evasion.`,
  });
}
