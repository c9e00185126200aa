// A model's provenance and settings as people read them — sizes, counts, hashes, short
// phrases — for `sluice inspect` and the report alike. Raw values (byte arrays, nested
// objects) never reach human output; `--json` keeps them.

import { summarizeTrainingFingerprint } from "../read/text-fingerprints.ts";
import { formatBytes, formatCount } from "./report-format.ts";

/** Provenance keys in the order they are shown, with their names; any other key follows. */
const PROVENANCE_NAMES: [string, string][] = [
  ["tool", "tool"],
  ["builtAt", "built at"],
  ["data", "training data"],
  ["dataSha256", "training data SHA-256"],
  ["examples", "examples read"],
  ["trainExamples", "examples trained on"],
  ["fields", "fields"],
  ["trainFingerprint", "training-text fingerprint"],
];

/**
 * The provenance (without its settings) as [name, text] pairs.
 * @example provenanceFacts({ tool: "sluice 0.1.0", examples: 6000 }) // [["tool", "sluice 0.1.0"], ["examples read", "6 000"]]
 */
export function provenanceFacts(provenance: Readonly<Record<string, unknown>>): [string, string][] {
  const facts: [string, string][] = [];
  for (const [key, name] of PROVENANCE_NAMES) if (key in provenance && provenance[key] !== undefined) facts.push([name, describeProvenanceValue(key, provenance[key])]);
  for (const [key, value] of Object.entries(provenance)) {
    if (key !== "settings" && value !== undefined && !PROVENANCE_NAMES.some(([known]) => known === key)) facts.push([key, describeValue(value)]);
  }
  return facts;
}

/**
 * The recorded build settings as [setting, text] pairs.
 * @example settingFacts({ charSpan: [0, 0], maxBytes: 1048576 }) // [["charSpan", "off"], ["maxBytes", "1 048 576 B (1.0 MiB)"]]
 */
export function settingFacts(settings: Readonly<Record<string, unknown>>): [string, string][] {
  return Object.entries(settings).map(([key, value]) => [key, describeSetting(key, value)]);
}

function describeProvenanceValue(key: string, value: unknown): string {
  if (key === "trainFingerprint") {
    const summary = summarizeTrainingFingerprint(value);
    if (summary === null) return "none";
    if ("error" in summary) return `unreadable (${summary.error})`;
    const sampled = summary.sampledShare < 1 ? `, a ${Math.round(summary.sampledShare * 100)}% sample` : "";
    return `Bloom filter of ${formatCount(summary.texts)} training texts${sampled}, ${formatBytes(summary.bytes)}, false-positive rate ${(summary.falsePositiveRate * 100).toFixed(2)}%`;
  }
  if (key === "fields" && typeof value === "object" && value !== null) {
    const fields = value as { text?: unknown; label?: unknown; labelSep?: unknown };
    const parts = [`text from ${Array.isArray(fields.text) ? fields.text.join(" + ") : describeValue(fields.text)}`, `label from ${describeValue(fields.label)}`];
    if (typeof fields.labelSep === "string") parts.push(`several labels separated by "${fields.labelSep}"`);
    return parts.join("; ");
  }
  return describeValue(value);
}

function describeSetting(key: string, value: unknown): string {
  if (key === "charSpan" && Array.isArray(value)) return value[0] === 0 ? "off" : `${value[0]}–${value[1]}`;
  if (key === "maxBytes" && typeof value === "number") return value === 0 ? "none" : formatBytes(value);
  if (key === "keepFeatures" && value === 0) return "no limit";
  if (key === "reviewBelow" && value === 0) return "off";
  if (typeof value === "object" && value !== null && !Array.isArray(value) && !isBytes(value) && Object.keys(value).length === 0) return "none";
  return describeValue(value);
}

function isBytes(value: unknown): value is Uint8Array | { type: "Buffer"; data: number[] } {
  if (value instanceof Uint8Array) return true;
  const object = value as { type?: unknown; data?: unknown };
  return typeof value === "object" && value !== null && object.type === "Buffer" && Array.isArray(object.data);
}

/**
 * Any value as short text: byte arrays by size, objects as "key value" phrases, lists joined.
 * @example describeValue({ spam: 0.95 }) // "spam 0.95"
 */
export function describeValue(value: unknown): string {
  if (value === null || value === undefined) return "none";
  if (typeof value === "string") return value;
  if (typeof value === "number") return Number.isInteger(value) && Math.abs(value) >= 10_000 ? formatCount(value) : String(value);
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (isBytes(value)) return `${formatBytes(value instanceof Uint8Array ? value.length : value.data.length)} of binary data`;
  if (Array.isArray(value)) return value.length === 0 ? "none" : value.map(describeValue).join(", ");
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>);
    return entries.length === 0 ? "none" : entries.map(([k, v]) => `${k} ${describeValue(v)}`).join(", ");
  }
  return String(value);
}
