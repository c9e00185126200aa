// Support e-mails written by hand for the routing tests, each about one topic only, with the
// topic a person reading it would give it (hand-labelled by the test's author; no source).
// They are new text in the invented Vellumcroft scenario (demo-data/README.md), not rows of
// demo-data/support-topics.csv, so the routing model never trained on them. Subject, blank
// line, body: the way the e-mail handler reads a message.

export interface HandLabelledMail {
  topic: string;
  text: string;
}

export const HAND_LABELLED_SUPPORT_MAIL: readonly HandLabelledMail[] = [
  { topic: "account-access", text: "Can't sign in\n\nHi, every time I try to log in the site says my password is incorrect, and the reset link you e-mail me has already expired when I click it. I'm locked out of my account. Thanks, Ines" },
  { topic: "account-access", text: "Two-step code never arrives\n\nHello, I turned on two-step verification and now the login code never reaches my phone, so I cannot get into my account at all. Please help me sign in again." },
  { topic: "billing", text: "Charged twice\n\nHello, my card statement shows two identical charges for the same order. I only placed it once. Could you refund the duplicate payment? Regards, Tobin" },
  { topic: "billing", text: "Invoice has the wrong VAT\n\nHi, the invoice for my last purchase lists the wrong tax amount and my company name is missing. Could you send me a corrected invoice for the payment?" },
  { topic: "product-question", text: "Does the Mossel lamp dim?\n\nHi, before I buy the Mossel desk lamp: does it have a dimmer, and what colour temperature is the bulb? Is it bright enough for reading? Thanks!" },
  { topic: "product-question", text: "Wendle filter question\n\nHello, how large a room can the Wendle air purifier handle, and how often does its filter need replacing? Is it quiet enough for a bedroom? Best, Marit" },
  { topic: "returns", text: "Return the kettle\n\nHi, I changed my mind about the Pilvo kettle, it is still unopened in its box. How do I send it back for a refund? Do you provide a return label?" },
  { topic: "returns", text: "Exchange for another size\n\nHello, the item I ordered is the wrong size for my kitchen. I'd like to return it and exchange it for the smaller one. What is your return process?" },
  { topic: "shipping", text: "Where is my parcel?\n\nHi, my order was dispatched a week ago but the tracking number has shown no update since, and the parcel hasn't arrived. When will it be delivered?" },
  { topic: "shipping", text: "Change delivery address\n\nHello, I just placed an order and typed my old address. Can you change the delivery address before the courier ships it? Thanks, Jorun" },
  { topic: "technical-fault", text: "Kettle stopped working\n\nHi, my Pilvo kettle won't turn on any more. The light doesn't come on and it does not heat the water, even on another socket. It is only two months old." },
  { topic: "technical-fault", text: "Purifier error light\n\nHello, my Wendle air purifier shows a flashing red error light and makes a loud rattling noise, then switches itself off. Is it broken?" },
];
