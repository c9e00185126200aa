// The data the evasion suite (evasion.ts) and its training-part check (evasion-check.ts) read:
// one definition of the rows, of the contact form's held-out part and of the policy targets,
// so the check's training parts are exactly the bench's.
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";

export interface Row {
  text: string;
  label: string;
  group: string;
}

/** The policy targets of each data set: spam blocked at 99% precision, abusive reviewed at 90% recall. */
export const MAIL_SPAM_TARGETS = { precision: { spam: 0.99 } as Record<string, number>, recall: {} as Record<string, number> };
export const CONTACT_FORM_TARGETS = { precision: { spam: 0.99 } as Record<string, number>, recall: { abusive: 0.9 } as Record<string, number> };

/** The rows of a prepared corpus file (text, label, group), leaving out rows without a single label. */
export function corpusRows(file: string): Row[] {
  return readJsonl(file)
    .filter((r) => typeof r.label === "string")
    .map((r) => ({ text: String(r.text), label: String(r.label), group: String(r.group) }));
}

/** The demo contact form, each row's id as its group. */
export function contactFormRows(): Row[] {
  return readJsonl(new URL("../../demo-data/contact-form.jsonl", import.meta.url).pathname).map((r) => ({ text: String(r.message), label: String(r.label), group: String(r.id) }));
}

/** Share in [0, 1) of a salted SHA-256 of `key`: a fixed, seeded split. */
export function hashShare(salt: string, key: string): number {
  return createHash("sha256").update(`${salt}:${key}`).digest().readUInt32BE(0) / 2 ** 32;
}

/** Whether a contact-form row (by id) is in the suite's test part: 20% by sha256 of the id. */
export function inContactFormTestPart(id: string): boolean {
  return hashShare("sluice-evasion-split-v1", id) < 0.2;
}

function readJsonl(file: string): Record<string, unknown>[] {
  return readFileSync(file, "utf8").split("\n").filter((line) => line.trim() !== "").map((line) => JSON.parse(line) as Record<string, unknown>);
}
