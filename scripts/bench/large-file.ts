// Data larger than memory: writes a ~1 GB JSONL file of synthetic support mail, then builds
// it with the CLI in a child process and reports that process's peak RSS (getrusage).
import { spawnSync } from "node:child_process";
import { createWriteStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { createRandom } from "../../compiler/train/random.ts";

const root = fileURLToPath(new URL("../..", import.meta.url));

async function writeLargeFile(path: string, targetBytes: number): Promise<number> {
  const random = createRandom(2026);
  const topics = ["billing", "shipping", "returns", "account-access", "technical-fault", "product-question"];
  const vocabulary: Record<string, string[]> = {
    billing: ["invoice", "charged", "refund", "payment", "card", "twice", "receipt", "amount"],
    shipping: ["parcel", "tracking", "courier", "delivery", "late", "address", "shipped", "arrive"],
    returns: ["return", "label", "exchange", "broken", "send", "back", "replacement", "wrong"],
    "account-access": ["login", "password", "reset", "locked", "account", "code", "email", "sign"],
    "technical-fault": ["error", "blinking", "crash", "turn", "power", "firmware", "noise", "stopped"],
    "product-question": ["size", "colour", "compatible", "warranty", "material", "stock", "model", "spec"],
  };
  const filler = "the a my is it and to for on with please hello thanks order since week today again still".split(" ");
  const out = createWriteStream(path);
  let written = 0;
  let lines = 0;
  while (written < targetBytes) {
    const topic = topics[Math.floor(random.next() * topics.length)];
    const words: string[] = [];
    const length = 20 + Math.floor(random.next() * 60);
    for (let i = 0; i < length; i++) words.push(random.next() < 0.3 ? vocabulary[topic][Math.floor(random.next() * 8)] : filler[Math.floor(random.next() * filler.length)]);
    const line = `${JSON.stringify({ text: words.join(" "), label: topic })}\n`;
    written += Buffer.byteLength(line);
    lines++;
    if (!out.write(line)) await new Promise<void>((resolve) => out.once("drain", () => resolve()));
  }
  await new Promise<void>((resolve) => out.end(() => resolve()));
  return lines;
}

export interface LargeFileResult {
  fileBytes: number;
  lines: number;
  seconds: number;
  peakRssMB: number;
  accuracy: number;
}

/** Generates the file, builds it on disk in a child process, returns peak RSS and time. */
export async function runLargeFile(targetBytes = 1024 ** 3): Promise<LargeFileResult> {
  const directory = mkdtempSync(join(tmpdir(), "sluice-large-"));
  try {
    const data = join(directory, "large.jsonl");
    const lines = await writeLargeFile(data, targetBytes);
    const started = performance.now();
    // The child prints its own peak RSS after the build (process.resourceUsage().maxRSS is in KB).
    const script = `import { register } from "tsx/esm/api"; register(); const { main } = await import(${JSON.stringify(join(root, "compiler/cli/main.ts"))}); const code = await main(${JSON.stringify(["build", data, "--out", join(directory, "large.sluice"), "--json", "--quiet", "--dims", "16", "--char-span", "0", "--epochs", "2", "--on-disk"])}); process.stderr.write("PEAK_RSS_KB=" + process.resourceUsage().maxRSS + "\\n"); process.exitCode = code;`;
    const child = spawnSync(process.execPath, ["--input-type=module", "-e", script], { cwd: root, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
    const seconds = (performance.now() - started) / 1000;
    if (child.status !== 0) throw new Error(`large-file build failed (${child.status}): ${child.stderr.slice(-2000)}`);
    const peak = /PEAK_RSS_KB=(\d+)/.exec(child.stderr);
    const report = JSON.parse(child.stdout.trim().split("\n").pop() as string) as { compiled: { accuracy: number } };
    return { fileBytes: statSync(data).size, lines, seconds, peakRssMB: peak ? Number(peak[1]) / 1024 : NaN, accuracy: report.compiled.accuracy };
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}
