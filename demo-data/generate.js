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
// Support inbox templates. Vocabulary overlaps on purpose (refund, order, app...).
const SUPPORT = {
  billing: {
    subjects: ["Charged twice for order {order}", "Wrong amount on my invoice", "Refund not showing on my card",
      "Question about my bill", "Invoice request", "Promo code didn't apply", "Subscription charge",
      "Double payment, please help", 'Unknown charge "VELLUMCROFT HG"', "Billing issue with order {order}"],
    sentences: ["I was charged {amount} twice for order {order}.",
      "My card statement shows {amount} but the order total was {amount}.",
      "Can you send me an invoice for order {order}? I need it for my expenses.",
      "I cancelled my subscription {date} but was still billed {amount} this month.",
      "The promo code {code} didn't apply at checkout, so I paid full price.",
      "When will the refund of {amount} for the overcharge reach my account?",
      "The payment failed on the website but the money was still taken from my account.",
      "Please update the billing address on my account, the invoice shows my old one.",
      "Why is there a {amount} fee on my invoice? Nobody mentioned it when I ordered.",
      "I paid part of order {order} with a gift card and the remaining balance looks wrong.",
      "Could you split the payment for order {order} across two cards?"],
    short: ["charged twice??", "refund for overcharge pls", "invoice?", "wrong amount billed", "billing question",
      "why was I charged {amount}", "double charge on {order}"],
  },
  shipping: {
    subjects: ["Where is my order {order}?", "Tracking not updating", "Parcel marked delivered but not here",
      "Change delivery address", "Delivery delay", "Missing items from my order", "Express shipping?",
      "Order {order} still not arrived", "Parcel stuck, {carrier}", "Wrong address on label"],
    sentences: ["Tracking for order {order} hasn't updated in {days} days.",
      "The {carrier} tracking says delivered but nothing arrived at my door.",
      "Can I change the delivery address for order {order}? I'm moving next week.",
      "My parcel has been stuck at the {carrier} depot for {days} days.",
      "How long does standard delivery usually take?", "Do you offer express shipping on the {product}?",
      "Only half of my order arrived, the rest of the items are missing.",
      "The courier left my parcel with a neighbour I don't know.",
      "The order should have arrived {date} and it still hasn't come.",
      "The tracking link {trackurl} just shows an error.",
      "Can the courier leave the parcel in the porch if I'm not home?"],
    short: ["where is my parcel", "where is my order", "tracking not working", "still waiting for {order}",
      "not delivered", "parcel??", "when will it arrive"],
  },
  returns: {
    subjects: ["Return request", "How do I return an item?", "Refund for returned order {order}",
      "Exchange for a different colour", "Return label", "Sent it back, no refund yet", "Wrong item received",
      "Return pickup didn't come", "Returning the {product}"],
    sentences: ["I'd like to return the {product} I bought {date}.", "How do I get a return label for order {order}?",
      "I sent back order {order} {days} days ago and still haven't had my refund.",
      "The {product} arrived damaged in the box and I want to send it back.",
      "Can I exchange the {product} for a different colour instead of a refund?",
      "Is the return window 30 days from delivery or from the order date?",
      "I booked a return pickup and stayed in all day, but the courier never came.",
      "My refund of {amount} for the returned item is missing from my account.",
      "Do I have to pay for return shipping if the item was faulty?",
      "I received the wrong item and need to swap it for the {product} I ordered.",
      "I threw away the original packaging, can I still return the {product}?"],
    short: ["return label pls", "want to return this", "exchange?", "refund for my return??", "how do i send it back",
      "return {order}"],
  },
  "account-access": {
    subjects: ["Can't log in", "Password reset not working", "Account locked", "Change my e-mail address",
      "Verification code not arriving", "Delete my account", "Suspicious login", "Login problem in the app",
      "No account found?"],
    sentences: ["I can't log in to my account, it says my password is wrong.",
      "The password reset e-mail never arrives, not even in spam.", "My account is locked after too many attempts.",
      "I want to change the e-mail on my account to {email}.",
      "The two-step verification code isn't coming through on my phone.", "Please delete my account and all my data.",
      "I got an alert about a login I don't recognise, someone else may be in my account.",
      "The app keeps logging me out every few minutes.",
      "I signed up with {email} but the site says no account exists.",
      "After logging in I can't see my order history or my saved addresses.",
      "I reset my password twice and the new one still doesn't work."],
    short: ["cant login", "password reset not working", "locked out!!", "account locked", "login broken",
      "reset link expired"],
  },
  "technical-fault": {
    subjects: ["{product} not working", "{product} won't turn on", "Error {errcode}", "Strange noise",
      "Firmware update failed", "App won't connect", "Overheating", "Blinking red light", "Warranty claim"],
    sentences: ["My {product} won't turn on at all.", "The {product} makes a loud buzzing noise.",
      "The {product} stopped working after {days} days of normal use.",
      "The app won't connect to my {product} over wi-fi.", "Error code {errcode} keeps showing on the display.",
      "The firmware update failed and now the {product} is stuck on the start screen.",
      "The {product} gets very hot after ten minutes.", "The light on the {product} keeps blinking red.",
      "I've tried resetting the {product} as the manual says but it still doesn't work.",
      "Is a fault like this covered by the warranty?", "The timer on the {product} resets itself every night."],
    short: ["{product} broken", "not working", "error {errcode}", "wont turn on", "it stopped working",
      "red light blinking??"],
  },
  "product-question": {
    subjects: ["Question about the {product}", "Colours?", "Back in stock?", "{product} vs {product2}", "Sizes",
      "Replacement parts", "Manual", "Is it dishwasher safe?", "Pre-order question"],
    sentences: ["Does the {product} come in other colours?",
      "What's the difference between the {product} and the {product2}?", "Is the {product} dishwasher safe?",
      "When will the {product} be back in stock?", "Can I use the {product} outdoors?",
      "What are the exact dimensions of the {product}?", "Does the {product} work with the {product2}?",
      "Do you sell replacement parts for the {product}?",
      "Is there a manual for the {product} I can read before I order?",
      "Will the {product} be on sale soon? It's {amount} at the moment.", "What is the {product} made of?"],
    short: ["in stock?", "colours?", "{product} size?", "does it come in black", "price?"],
  },
};
const GENERIC_SHORT = ["help!!", "hello?", "please call me", "urgent", "?", "any update?"];
const GREETINGS = ["Hi,", "Hello there,", "Dear Vellumcroft team,", "Hey support,", "Good morning,",
  "To whom it may concern,", "Hi {staff},"];
const SIGN_OFFS = ["Thanks,\n{first}", "Kind regards,\n{first}\n{email}", "Cheers, {first}",
  "Best,\n{first}\nSent from my phone", "Many thanks\n{first} ({email})", "Thank you!"];
const FILLERS = ["I've been a customer for {years} years and never had a problem before.",
  "I ordered {date} using my usual account.", "My order number is {order} in case you need it.",
  "I already read the help page at {url} but couldn't find an answer.",
  "I'd appreciate a quick reply as I'm away next week.", "This is the {nth} time I'm writing about this.",
  "Please let me know if you need photos or anything else from me.",
  "My phone number is on the account if calling is easier.", "Thanks in advance for looking into it.",
  "I spoke to {staff} on the chat but the conversation was cut off.",
  "To be honest I'm getting a bit frustrated, but I'm sure it's a simple mix-up.",
  "The order was a gift, so timing matters quite a lot here.",
  "You can also reach me at {email}, that inbox is checked more often.",
  "The total for the whole order was {amount}, including delivery.",
  "I also bought a {product} in the same order, that one is fine.",
  "Last time your team sorted things out within a day, which was great.",
  "I'm not very good with computers, so please keep the steps simple."];
const QUOTED_REPLY = "\n\n> On the {day}, {staff} <{staffemail}> wrote:\n> Thanks for contacting us, we're looking into it and will reply within 48 hours.";
const EMOJI = ["🙂", "🙏", "😩", "😡", "📦", "🤔", "👍", "😕", "⚠️", "❤️"];

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

// ---------------------------------------------------------------------------
// Contact form templates.
const CONTACT = {
  ok: {
    question: ["Do you have a shop I can visit, or is it online only?", "Is shipping free on orders over $50?",
      "Is the {product} made from recycled materials?", "Do you offer gift wrapping?",
      "What are your customer support hours?", "Can I pay for the {product} in instalments?",
      "Do you offer discounts for bulk orders for our office?", "Are you hiring for the warehouse team?",
      "Do you ship abroad, and how much does it cost?",
      "Can I order a {product} as a gift and send it to another address?"],
    feedback: ["Just wanted to say the {product} is brilliant, thank you!",
      "Your delivery driver was really friendly.", "The new website is so much easier to use.",
      "Love the {product}, I bought a second one for my mum.", "Suggestion: please add a dark mode to the app.",
      "{staff} on your chat team was super helpful today.", "Great packaging, no plastic at all. Keep it up!",
      "The {product} is nice but the instructions were confusing."],
    partnership: ["Hi, I run {biz}, a small design studio, and we'd love to talk about stocking the {product}.",
      "I write for {biz} and would like to review the {product} in our spring issue.",
      "We're organising a makers' fair and would like to invite Vellumcroft to have a stall.",
      "I'd like to discuss a wholesale account for {biz}. You can reach me at {email}.",
      "Our portfolio is at https://www.example.com/portfolio if you're looking for a photographer for your catalogue.",
      "Would you be interested in a joint giveaway with {biz}? No fees, just a shared post."],
    complaint: ["This is the worst service I've had, I want my money back.",
      "I am absolutely furious. Three weeks and still no {product}.",
      "Unacceptable. Nobody has answered my e-mails about order {order}.",
      "I'm disgusted with how my complaint was handled.",
      "If I don't get a refund by Friday I will dispute the charge with my bank.",
      "Your customer service is terrible and I will never order from you again.",
      "Ridiculous!!! Still no reply after {days} days!!!",
      "I'm leaving a one-star review everywhere I can. Fix this NOW.",
      "Honestly, is anyone even reading these? This is a joke.",
      "I'm so angry I could scream. The {product} broke on day one and you ignore me."],
    // Hard negatives: insult words aimed at oneself, not at staff.
    borderline: ["I'm such an idiot, I typed the wrong address. Can I still change it for order {order}?",
      "I feel like a clown, I ordered the wrong size twice. Can you help me swap it?",
      "Don't be an idiot like me and forget to check the voltage, lol. Anyway, do you sell an adapter?",
      "Pathetic of me, I know, but I lost the receipt. Can you resend it to {email}?",
      "Click the free gift banner on your homepage and nothing happens, just so you know."],
  },
  spam: {
    seo: ["Hello, I noticed {domain} is not ranking on the first page. We can get you to #1 in 30 days. Reply for a free audit.",
      "We offer high-quality backlinks from DA 90+ sites. Cheap prices! {spamurl}",
      "Boost your traffic by 500%!!! Guaranteed results. Visit {spamurl}",
      "Dear website owner, {spambiz} can fix your SEO errors today. Special offer ends soon!",
      "Hi, I'm {first} from {spambiz}. We help online stores like yours grow. Open to a quick call?"],
    money: ["Turn $100 into $10,000 in one week with our crypto trading bot 🚀🚀🚀 {spamurl}",
      "Earn $500 a day from home!!! No experience needed. Click here: {spamurl}",
      "Instant loans approved in 5 minutes, no credit check!!! Apply at {spamurl}",
      "Need cash fast? Get up to $5000 today from {spambiz}. Limited offer.",
      "Exclusive investment opportunity, 40% monthly returns guaranteed $$$ {spamurl}"],
    followers: ["Buy 10,000 real followers for only $9.99!! {spamurl}",
      "Get more likes and followers instantly. Free trial at {spamurl}",
      "Your brand deserves to go viral. 1M views guaranteed!!! {spamurl}"],
    prize: ["Congratulations!!! You have been selected to receive a free gift card. Claim now: {spamurl}",
      "WINNER NOTICE: your e-mail won $1,000,000. Send your details to {email} to claim.",
      "You are our lucky visitor of the day!!! Click {spamurl} to get your free prize"],
    links: ["{spamurl} {spamurl} {spamurl}", "best deals {spamurl} cheap {spamurl} free {spamurl} {spamurl}",
      "check this out {spamurl}"],
  },
  abusive: {
    insult: ["You people are pathetic.", "Useless clowns, the lot of you.", "What kind of idiot packed this?",
      "Your support staff are complete idiots.", "Are you brain-dead? I've explained it five times.",
      "Stop sending scripted replies, you morons.", "Pathetic losers. Absolute clowns.",
      "Whoever answers these e-mails is a total idiot.", "You're all incompetent fools."],
    threat: ["You'll regret this.", "Fix my order or you'll regret it, I promise you.",
      "Keep ignoring me and you'll be sorry.", "I hope every one of you gets fired."],
    // Same vocabulary as the angry-but-ok complaints, then aimed at staff.
    mixed: ["Three weeks and no {product}. You are useless clowns.",
      "I want my money back for order {order}, you pathetic idiots.",
      "{staff}, you are the most useless person I've ever dealt with. Refund me.",
      "Nobody answers my e-mails. Do you hire idiots on purpose?"],
  },
};
const SHORT_CONTACT = {
  ok: ["thanks!", "love it ❤️", "hello?", "is anyone there", "great service", "when do you restock?", "call me back please"],
  spam: ["fr3e followers {spamurl}", "$$$ click here {spamurl}", "cheap seo!!!", "{spamurl}", "loans now!!!"],
  abusive: ["idiots.", "pathetic", "useless clowns", "morons!!", "you'll regret this"],
};
const CONTACT_GREETINGS = ["Hi,", "Hello,", "Hi there,", "Dear team,", "Good afternoon,"];
const CONTACT_SIGN_OFFS = ["Thanks,\n{first}", "Regards, {first}", "{first}\n{email}", "Best wishes\n{first}"];
const OK_LONG_FILLERS = ["I ordered {date} and have been a customer for {years} years.",
  "I'd really appreciate a reply this week.", "My order number is {order}.", "You can reach me at {email}.",
  "I've already looked at {url}.", "Thanks for reading this far!",
  "It's not a big deal, but I thought you should know.",
  "Everyone I know has recommended you, which is why this surprised me."];
const SPAM_LONG_FILLERS = ["Our team has helped over 5,000 businesses worldwide.", "This offer is 100% risk free.",
  "Reply YES to get started today!!!", "Don't miss out, only 3 spots left.", "Unsubscribe: {spamurl}",
  "We accept all payment methods.", "Call our agents 24/7.", "See our results at {spamurl}"];
const ABUSIVE_LONG_FILLERS = ["I've been waiting {days} days for order {order}.", "Nobody ever answers the phone.",
  "I've written to you {n} times.", "Every single reply is copy and paste.", "I paid {amount} for this."];
const SPAM_NAMES = ["SEO Expert", "Crypto Advisor", "Loan Team", "Best Offers", "Prize Department",
  "{first} from {spambiz}", "Marketing Manager", "{spambiz}"];
const LEET = { free: "fr3e", click: "c1ick", now: "n0w", money: "m0ney", cash: "ca$h", offer: "0ffer",
  guaranteed: "guaranteeed", winner: "w1nner", followers: "f0llowers", loans: "l0ans", prize: "pr1ze" };

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
