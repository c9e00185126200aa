// Seeded generator for the bundled demo data of an invented company, Vellumcroft
// Home Goods. Everything here (company, products, carriers, people, businesses)
// is made up; every e-mail address and URL uses a reserved domain (RFC 2606 /
// RFC 6761: example.com, example.net, example.org and the .example TLD).
//
// Run: `node demo-data/generate.js` (or `npm run demo-data`). One seed drives
// every choice, so a re-run writes byte-identical files.
//
// Deliberate noise, so the demo models have something realistic to learn from:
// - shared vocabulary across labels ("refund", "order", "account", product names),
// - typos in about 10% of the words of about 20% of the messages,
// - very short and long (150-300 word) messages, mixed case, emoji,
// - MISLABEL_RATE (3%) of the rows in each file get their label swapped to a
//   random other label on purpose, to mimic human labelling mistakes,
// - contact form: spam with obfuscated words, zero-width spaces (U+200B) and
//   fullwidth letters (to exercise NFKC normalization); angry-but-polite
//   complaints and self-deprecating "idiot" messages labelled ok (hard negatives).

import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { SUPPORT, GENERIC_SHORT, GREETINGS, SIGN_OFFS, FILLERS, QUOTED_REPLY, EMOJI } from "./support-templates.js";
import { CONTACT, SHORT_CONTACT, CONTACT_GREETINGS, CONTACT_SIGN_OFFS, OK_LONG_FILLERS, SPAM_LONG_FILLERS, ABUSIVE_LONG_FILLERS, SPAM_NAMES, LEET } from "./contact-templates.js";

const SEED = 0x5eed2024;
const MISLABEL_RATE = 0.03;
const OUT_DIR = dirname(fileURLToPath(import.meta.url));
const COMPANY = "Vellumcroft Home Goods";
const DOMAIN = "vellumcroft.example";

// Rows per topic: the largest (shipping) is 3x the smallest (product-question).
const TOPIC_COUNTS = {
  shipping: 1500, billing: 1200, returns: 1000,
  "technical-fault": 950, "account-access": 850, "product-question": 500,
};
const CONTACT_COUNTS = { ok: 3500, spam: 1000, abusive: 500 };

// ---------------------------------------------------------------------------
// Random source: mulberry32, a small 32-bit PRNG (public-domain, Tommy Ettinger).
function mulberry32(seed) {
  let state = seed >>> 0;
  return function next() {
    state = (state + 0x6d2b79f5) | 0;
    let t = Math.imul(state ^ (state >>> 15), 1 | state);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const random = mulberry32(SEED);
const int = (low, high) => low + Math.floor(random() * (high - low + 1));
const pick = (items) => items[Math.floor(random() * items.length)];
const chance = (probability) => random() < probability;

function shuffle(items) {
  const copy = items.slice();
  for (let i = copy.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [copy[i], copy[j]] = [copy[j], copy[i]];
  }
  return copy;
}

/** Picks a key of `weights` with probability proportional to its value. */
function pickWeighted(weights) {
  const entries = Object.entries(weights);
  let roll = random() * entries.reduce((sum, [, weight]) => sum + weight, 0);
  for (const [key, weight] of entries) {
    roll -= weight;
    if (roll < 0) return key;
  }
  return entries[entries.length - 1][0];
}

// ---------------------------------------------------------------------------
// Slot fillers: `{name}` in a template is replaced by SLOTS.name().
const FIRST_NAMES = ["Priya", "Tomas", "Ines", "Marek", "Aisha", "Lena", "Oskar", "Noor", "Felix", "Ruth", "Dev",
  "Hana", "Jonas", "Mira", "Callum", "Zofia", "Emeka", "Greta", "Luis", "Yara", "Bram", "Sade", "Theo", "Ivy", "Ravi",
  "Elsa", "Kofi", "Maren", "Nils", "Tamsin"];
const STAFF = ["Odile", "Barnaby", "Wren", "Saoirse", "Anselm", "Petra"];
const PRODUCTS = ["Pilvo kettle", "Threnna coffee grinder", "Mossel desk lamp", "Corlan throw blanket",
  "Duvra planter", "Saffel toaster", "Wendle air purifier", "Nimbri smart plug", "Ostra rice cooker",
  "Tavel bedside clock"];
const CARRIERS = ["Parcelwren", "Quillpost", "Corvel Freight"];
const BUSINESSES = ["Ambrevel Studio", "Tallowmark Design", "Wrenhollow Makers", "Quorrel Press", "Fennick Gazette",
  "Lintwhistle Interiors"];
const SPAM_BUSINESSES = ["Seorbit Media", "Clikgrow Digital", "Linkvora Agency", "Coinstrato Capital",
  "Quikfund Lending"];
const EMAIL_DOMAINS = ["example.com", "example.net", "example.org"];
const DATES = ["last Monday", "on the 3rd", "on the 14th", "two weeks ago", "yesterday", "last Friday", "on the 21st",
  "at the start of the month"];
const HELP_PAGES = ["returns", "delivery", "billing", "account", "warranty", "faq"];

let lastProduct = "";
const SLOTS = {
  first: () => pick(FIRST_NAMES),
  staff: () => pick(STAFF),
  product: () => (lastProduct = pick(PRODUCTS)),
  product2: () => pick(PRODUCTS.filter((product) => product !== lastProduct)),
  order: () => `#${pick("ABCDEFGHJKLMNPRSTUVWXYZ")}${int(10000, 99999)}`,
  amount: () => `$${int(4, 420)}.${String(int(0, 99)).padStart(2, "0")}`,
  code: () => pick(["SPRING", "WELCOME", "COSY", "HOME"]) + int(10, 40),
  errcode: () => `E${int(1, 9)}${int(0, 9)}`,
  days: () => String(int(2, 19)),
  years: () => String(int(2, 9)),
  nth: () => pick(["second", "third", "fourth", "fifth"]),
  date: () => pick(DATES),
  carrier: () => pick(CARRIERS),
  biz: () => pick(BUSINESSES),
  spambiz: () => pick(SPAM_BUSINESSES),
  email: () => `${pick(FIRST_NAMES).toLowerCase()}${pick([".", "_", ""])}${int(1, 99)}@${pick(EMAIL_DOMAINS)}`,
  staffemail: () => `${pick(STAFF).toLowerCase()}@${DOMAIN}`,
  url: () => `https://${DOMAIN}/help/${pick(HELP_PAGES)}`,
  trackurl: () => `https://track.example.net/${pick(CARRIERS).split(" ")[0].toLowerCase()}/${int(100000, 999999)}`,
  spamurl: () => pick([
    () => `http://cheap-seo-${int(1, 99)}.example/offer`,
    () => `https://${pick(["win", "cash", "grow", "boost", "crypto", "loan"])}${pick(["fast", "now", "pro", "max"])}.example.net/?ref=${int(100, 9999)}`,
    () => `http://www.example.org/${pick(["promo", "deal", "gift", "bonus"])}/${int(1000, 99999)}`,
    () => `https://get-${pick(["followers", "likes", "ranking", "traffic"])}.example`,
  ])(),
  n: () => String(int(2, 9)),
  domain: () => DOMAIN,
  day: () => pick(["3rd", "9th", "14th", "21st", "28th"]),
};

/** Replaces every `{slot}` in the template with a fresh value. */
function fill(template) {
  return template.replace(/\{(\w+)\}/g, (_, key) => {
    if (!(key in SLOTS)) throw new Error(`generate.js: unknown slot {${key}} in template "${template}"`);
    return SLOTS[key]();
  });
}


// ---------------------------------------------------------------------------
// Noise helpers.
const KEYBOARD_NEIGHBOURS = { a: "sq", e: "wr", i: "uo", o: "ip", n: "bm", r: "et", s: "ad", t: "ry", l: "k", d: "sf" };

/** Misspells one word: swaps two letters, drops, doubles or mistypes one. */
function misspell(word) {
  const at = int(0, word.length - 2);
  const kind = int(0, 3);
  if (kind === 0) return word.slice(0, at) + word[at + 1] + word[at] + word.slice(at + 2);
  if (kind === 1) return word.slice(0, at) + word.slice(at + 1);
  if (kind === 2) return word.slice(0, at) + word[at] + word.slice(at);
  const neighbours = KEYBOARD_NEIGHBOURS[word[at].toLowerCase()];
  return neighbours ? word.slice(0, at) + pick(neighbours) + word.slice(at + 1) : word.slice(0, at) + word.slice(at + 1);
}

/** Adds typos to about `rate` of the words; e-mails, URLs, order numbers and amounts stay intact. */
function addTypos(text, rate) {
  return text.split(" ").map((token) => {
    if (!chance(rate) || /[@#$/]/.test(token)) return token;
    return token.replace(/[A-Za-z]{3,}/, misspell);
  }).join(" ");
}

/** Shouting, lazy lower case, or unchanged. */
function applyCase(text, shoutRate, lowerRate) {
  const roll = random();
  if (roll < shoutRate) return text.toUpperCase();
  if (roll < shoutRate + lowerRate) return text.toLowerCase();
  return text;
}

function appendEmoji(text) {
  return `${text}${pick([" ", ""])}${pick(EMOJI)}${chance(0.3) ? pick(EMOJI) : ""}`;
}

/** Shared noise for every message: typos, case, emoji. */
function addNoise(text, { typoRate = 0.2, shoutRate = 0.03, lowerRate = 0.07, emojiRate = 0.06 } = {}) {
  let noisy = chance(typoRate) ? addTypos(text, 0.1) : text;
  noisy = applyCase(noisy, shoutRate, lowerRate);
  return chance(emojiRate) ? appendEmoji(noisy) : noisy;
}

function countWords(text) {
  return text.split(/\s+/).filter(Boolean).length;
}

/** Builds a long message: greeting, sentences up to a word target, optional quote, sign-off. */
function longMessage(topicSentences, fillers, greetings, signOffs, minWords, maxWords) {
  const target = int(minWords, maxWords);
  const topical = shuffle(topicSentences).slice(0, int(4, 7));
  const pool = shuffle(fillers);
  const paragraphs = [];
  let sentences = [];
  let words = 0;
  while (words < target && (topical.length || pool.length)) {
    const next = fill(topical.length && (chance(0.6) || !pool.length) ? topical.shift() : pool.shift());
    sentences.push(next);
    words += countWords(next);
    if (sentences.length >= int(2, 4)) { paragraphs.push(sentences.join(" ")); sentences = []; }
  }
  if (sentences.length) paragraphs.push(sentences.join(" "));
  return `${fill(pick(greetings))}\n\n${paragraphs.join("\n\n")}\n\n${fill(pick(signOffs))}`;
}

/** Relabels a deliberate MISLABEL_RATE share of the rows to a random other label. */
function mislabel(rows, labels, key) {
  const count = Math.round(rows.length * MISLABEL_RATE);
  const chosen = shuffle(rows.map((_, index) => index)).slice(0, count);
  for (const index of chosen) rows[index][key] = pick(labels.filter((label) => label !== rows[index][key]));
  return count;
}

/** Label order for a file: exact counts per label, shuffled. */
function labelSequence(counts) {
  return shuffle(Object.entries(counts).flatMap(([label, count]) => Array(count).fill(label)));
}

function countBy(rows, key) {
  const counts = {};
  for (const row of rows) counts[row[key]] = (counts[row[key]] ?? 0) + 1;
  return Object.fromEntries(Object.entries(counts).sort(([a], [b]) => a.localeCompare(b)));
}

// ---------------------------------------------------------------------------
// Support inbox (CSV).
function supportSubject(templates) {
  if (chance(0.03)) return "";
  let subject = fill(pick(templates));
  if (chance(0.1)) subject = `${pick(["Re: ", "Fwd: ", "RE: "])}${subject}`;
  if (chance(0.05)) subject = `URGENT: ${subject}`;
  return subject;
}

function supportBody(topic) {
  const { sentences, short } = SUPPORT[topic];
  const shape = pickWeighted({ short: 12, medium: 76, long: 12 });
  if (shape === "short") return fill(chance(0.2) ? pick(GENERIC_SHORT) : pick(short));
  if (shape === "long") {
    const body = longMessage(sentences, FILLERS, GREETINGS, SIGN_OFFS, 150, 300);
    return chance(0.3) ? body + fill(QUOTED_REPLY) : body;
  }
  const parts = shuffle(sentences).slice(0, int(1, 3)).map(fill);
  if (chance(0.3)) parts.push(fill(pick(FILLERS)));
  let body = parts.join(" ");
  if (chance(0.35)) body = `${fill(pick(GREETINGS))} ${body}`;
  if (chance(0.25)) body = `${body}\n${fill(pick(SIGN_OFFS))}`;
  return body;
}

function supportRows() {
  return labelSequence(TOPIC_COUNTS).map((topic, index) => ({
    id: String(index + 1),
    subject: addNoise(supportSubject(SUPPORT[topic].subjects), { typoRate: 0.1, emojiRate: 0.02 }),
    body: addNoise(supportBody(topic)),
    topic,
  }));
}

/** RFC 4180 field: quoted when it holds a comma, quote, CR or LF; quotes doubled. */
function csvField(value) {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

function toCsv(rows, columns) {
  const lines = [columns.join(",")];
  for (const row of rows) lines.push(columns.map((column) => csvField(row[column])).join(","));
  return lines.join("\n") + "\n";
}

/** Replaces a few spam words with look-alike spellings. */
function obfuscate(text) {
  return text.replace(/[A-Za-z]+/g, (word) => (LEET[word.toLowerCase()] && chance(0.6) ? LEET[word.toLowerCase()] : word));
}

/** Hides a zero-width space (U+200B) inside one to three words. */
function insertZeroWidth(text) {
  const words = text.split(" ");
  for (let k = int(1, 3); k > 0; k--) {
    const at = int(0, words.length - 1);
    if (/^[A-Za-z]{4,}$/.test(words[at])) {
      const cut = int(1, words[at].length - 1);
      words[at] = words[at].slice(0, cut) + "\u200B" + words[at].slice(cut);
    }
  }
  return words.join(" ");
}

/** Writes some ASCII letters and digits as fullwidth forms (U+FF01..U+FF5E), which NFKC folds back. */
function toFullwidth(text) {
  const wholeMessage = chance(0.3);
  return text.split(" ").map((word) => (wholeMessage || chance(0.3)
    ? word.replace(/[A-Za-z0-9!$]/g, (char) => String.fromCharCode(char.charCodeAt(0) + 0xfee0))
    : word)).join(" ");
}

const CONTACT_KINDS = {
  ok: { question: 30, feedback: 20, partnership: 12, complaint: 30, borderline: 8 },
  spam: { seo: 30, money: 25, followers: 15, prize: 15, links: 15 },
  abusive: { insult: 40, threat: 20, mixed: 40 },
};
const LONG_FILLERS = { ok: OK_LONG_FILLERS, spam: SPAM_LONG_FILLERS, abusive: ABUSIVE_LONG_FILLERS };

function contactName(label) {
  if (label === "spam") return chance(0.3) ? fill(pick(SPAM_NAMES)) : fill("{first}");
  if (chance(0.06)) return "";
  return pick([() => fill("{first}"), () => `${fill("{first}")} ${pick("ABCDEFGHJKLMNPRSTW")}.`, () => fill("{first}").toLowerCase()])();
}

function contactMessage(label) {
  const kind = pickWeighted(CONTACT_KINDS[label]);
  const templates = CONTACT[label][kind];
  const shape = pickWeighted({ short: 15, medium: 75, long: 10 });
  if (shape === "short") return fill(pick(SHORT_CONTACT[label]));
  if (shape === "long") {
    return longMessage(templates, LONG_FILLERS[label], CONTACT_GREETINGS, CONTACT_SIGN_OFFS, 60, 200);
  }
  let message = shuffle(templates).slice(0, int(1, 2)).map(fill).join(" ");
  // Abusive rows often open with a normal complaint, so the insult is the only tell.
  if (label === "abusive" && chance(0.4)) message = `${fill(pick(CONTACT.ok.complaint))} ${message}`;
  if (chance(0.3)) message = `${message} ${fill(pick(LONG_FILLERS[label]))}`;
  if (label === "ok" && chance(0.2)) message = `${fill(pick(CONTACT_GREETINGS))} ${message}`;
  return message;
}

function contactRows() {
  return labelSequence(CONTACT_COUNTS).map((label, index) => {
    let message = contactMessage(label);
    if (label === "spam") {
      if (chance(0.3)) message = obfuscate(message);
      if (chance(0.15)) message = insertZeroWidth(message);
      if (chance(0.08)) message = toFullwidth(message);
      if (chance(0.2)) message = message.replace(/!/g, "!!!");
    }
    if (label === "abusive" && chance(0.1)) message = message.replace(/idiot/g, "id1ot").replace(/clown/g, "cl0wn");
    const noise = label === "ok" ? {} : { shoutRate: 0.12, lowerRate: 0.08 };
    return { id: index + 1, name: contactName(label), message: addNoise(message, noise), label };
  });
}

// ---------------------------------------------------------------------------
// Samples shown by the demo: five support questions, three contact-form messages.
const SAMPLES = [
  "Hi, I was charged twice for order #B20417, can you refund one of the payments?",
  "Where is my parcel? The tracking hasn't moved in 6 days.",
  "I'd like to return the Corlan throw blanket, how do I get a return label?",
  "My Pilvo kettle won't turn on since this morning and the light keeps blinking red.",
  "I can't log in, the password reset e-mail never arrives.",
  "This is the worst service I've had, I want my money back.",
  "Get 10,000 fr3e followers today!!! Visit https://get-followers.example",
  "You people are useless clowns, you'll regret this.",
];

function readme(files) {
  const table = (counts) => Object.entries(counts).map(([label, count]) => `\`${label}\` ${count}`).join(", ");
  return `# Demo data

Invented scenario: **${COMPANY}**, a fictional online shop for kitchen and home gadgets
(the Pilvo kettle, the Mossel desk lamp, the Wendle air purifier and friends). Its support inbox is
routed by topic, and its public contact form is moderated. The company, products, carriers, businesses
and people are all made up; every e-mail address and URL uses a reserved domain (\`example.com\`,
\`example.net\`, \`example.org\`, \`${DOMAIN}\`).

| file | rows | columns / keys | labels | size |
| --- | --- | --- | --- | --- |
| \`support-topics.csv\` | ${files.support.rows} | \`id,subject,body,topic\` (RFC 4180, LF line ends, header row) | ${table(files.support.counts)} | ${files.support.bytes} bytes |
| \`contact-form.jsonl\` | ${files.contact.rows} | \`id\`, \`name\`, \`message\`, \`label\` | ${table(files.contact.counts)} | ${files.contact.bytes} bytes |
| \`samples.txt\` | ${SAMPLES.length} | one text per line | (unlabelled: support questions and contact-form messages) | ${files.samples.bytes} bytes |

Label counts above are after the deliberate mislabelling below.

## Noise, on purpose

- Vocabulary overlaps between labels ("refund", "order", "account", product names), and messages
  range from a single word to 300-word e-mails with greetings, signatures, quoted replies, order numbers
  like \`#A12345\`, amounts like \`$42.50\`, URLs, mixed case, emoji and typos.
- **About ${MISLABEL_RATE * 100}% of the rows in each file are mislabelled on purpose** (label swapped to a random
  other label: ${files.support.mislabelled} in the CSV, ${files.contact.mislabelled} in the JSONL), to mimic human labelling mistakes.
- Contact form: spam uses look-alike spellings (\`fr3e\`), zero-width spaces (U+200B) and fullwidth
  letters (folded by NFKC normalization); angry but non-abusive complaints and self-deprecating
  messages ("I'm such an idiot, I typed the wrong address") are labelled \`ok\` as hard negatives.

## Regenerate

\`npm run demo-data\` (runs \`node demo-data/generate.js\`). The generator has no dependencies and uses a
seeded PRNG (mulberry32, seed \`0x${SEED.toString(16)}\`), so re-running writes byte-identical files.
`;
}

function main() {
  const support = supportRows();
  const supportMislabelled = mislabel(support, Object.keys(TOPIC_COUNTS), "topic");
  const contact = contactRows();
  const contactMislabelled = mislabel(contact, Object.keys(CONTACT_COUNTS), "label");

  const supportText = toCsv(support, ["id", "subject", "body", "topic"]);
  const contactText = contact.map((row) => JSON.stringify(row)).join("\n") + "\n";
  const samplesText = SAMPLES.join("\n") + "\n";
  const files = {
    support: { rows: support.length, counts: countBy(support, "topic"), bytes: Buffer.byteLength(supportText), mislabelled: supportMislabelled },
    contact: { rows: contact.length, counts: countBy(contact, "label"), bytes: Buffer.byteLength(contactText), mislabelled: contactMislabelled },
    samples: { bytes: Buffer.byteLength(samplesText) },
  };
  writeFileSync(join(OUT_DIR, "support-topics.csv"), supportText);
  writeFileSync(join(OUT_DIR, "contact-form.jsonl"), contactText);
  writeFileSync(join(OUT_DIR, "samples.txt"), samplesText);
  writeFileSync(join(OUT_DIR, "README.md"), readme(files));
  console.log(JSON.stringify(files, null, 2));
}

main();
