// Contact form templates of the invented company's demo data (see generate.js): messages per
// label and kind, greetings, sign-offs, fillers and the look-alike spellings spam uses. Plain
// data: `{name}` slots are filled by generate.js, which makes every random choice.
// Contact form templates.
export const CONTACT = {
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
export const SHORT_CONTACT = {
  ok: ["thanks!", "love it ❤️", "hello?", "is anyone there", "great service", "when do you restock?", "call me back please"],
  spam: ["fr3e followers {spamurl}", "$$$ click here {spamurl}", "cheap seo!!!", "{spamurl}", "loans now!!!"],
  abusive: ["idiots.", "pathetic", "useless clowns", "morons!!", "you'll regret this"],
};
export const CONTACT_GREETINGS = ["Hi,", "Hello,", "Hi there,", "Dear team,", "Good afternoon,"];
export const CONTACT_SIGN_OFFS = ["Thanks,\n{first}", "Regards, {first}", "{first}\n{email}", "Best wishes\n{first}"];
export const OK_LONG_FILLERS = ["I ordered {date} and have been a customer for {years} years.",
  "I'd really appreciate a reply this week.", "My order number is {order}.", "You can reach me at {email}.",
  "I've already looked at {url}.", "Thanks for reading this far!",
  "It's not a big deal, but I thought you should know.",
  "Everyone I know has recommended you, which is why this surprised me."];
export const SPAM_LONG_FILLERS = ["Our team has helped over 5,000 businesses worldwide.", "This offer is 100% risk free.",
  "Reply YES to get started today!!!", "Don't miss out, only 3 spots left.", "Unsubscribe: {spamurl}",
  "We accept all payment methods.", "Call our agents 24/7.", "See our results at {spamurl}"];
export const ABUSIVE_LONG_FILLERS = ["I've been waiting {days} days for order {order}.", "Nobody ever answers the phone.",
  "I've written to you {n} times.", "Every single reply is copy and paste.", "I paid {amount} for this."];
export const SPAM_NAMES = ["SEO Expert", "Crypto Advisor", "Loan Team", "Best Offers", "Prize Department",
  "{first} from {spambiz}", "Marketing Manager", "{spambiz}"];
export const LEET = { free: "fr3e", click: "c1ick", now: "n0w", money: "m0ney", cash: "ca$h", offer: "0ffer",
  guaranteed: "guaranteeed", winner: "w1nner", followers: "f0llowers", loans: "l0ans", prize: "pr1ze" };
