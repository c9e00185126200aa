// Peak memory of a default build: writes a ~100 MB CSV of short synthetic texts over 12
// labels (seeded), builds it with the CLI's default settings in a child process, and reports
// that process's peak RSS (getrusage), the time, whether the build went on disk, and the
// build report's own peak-memory line. The target: peak RSS ≤ 2 × input + 300 MB, with the
// build no more than 10% slower than in memory. Run alone:
// `node --import tsx scripts/bench/default-build-memory.ts [--mb 100]` builds the file twice,
// one after the other: the path the projection chooses, then forced in memory
// (`--max-memory 64g`), and prints wall and CPU time of both; `-- extra build flags` runs one
// build with those flags instead.
import { spawnSync } from "node:child_process";
import { createWriteStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { createRandom } from "../../compiler/train/random.ts";

const root = fileURLToPath(new URL("../..", import.meta.url));

/** Writes `targetBytes` of CSV: short texts (8 to 40 words) whose words lean towards one of 12 labels. */
export async function writeShortTextCsv(path: string, targetBytes: number): Promise<number> {
  const random = createRandom(1217);
  const labels = Array.from({ length: 12 }, (_, i) => `topic-${String.fromCharCode(97 + i)}`);
  const syllables = ["ka", "lo", "mi", "ne", "ru", "sa", "ti", "vo", "xe", "zu", "pa", "de", "go", "fi", "bu", "ha"];
  const word = () => syllables[Math.floor(random.next() * 16)] + syllables[Math.floor(random.next() * 16)] + syllables[Math.floor(random.next() * 16)];
  const shared = Array.from({ length: 3000 }, word);
  const own = labels.map(() => Array.from({ length: 200 }, word));
  const out = createWriteStream(path);
  out.write("text,label\n");
  let written = 11;
  let lines = 0;
  while (written < targetBytes) {
    const label = Math.floor(random.next() * labels.length);
    const words: string[] = [];
    const length = 8 + Math.floor(random.next() * 33);
    for (let i = 0; i < length; i++) words.push(random.next() < 0.25 ? own[label][Math.floor(random.next() * 200)] : shared[Math.floor(random.next() * shared.length)]);
    const line = `${words.join(" ")},${labels[label]}\n`;
    written += line.length;
    lines++;
    if (!out.write(line)) await new Promise<void>((resolve) => out.once("drain", () => resolve()));
  }
  await new Promise<void>((resolve) => out.end(() => resolve()));
  return lines;
}

export interface DefaultBuildMemoryResult {
  fileBytes: number;
  lines: number;
  seconds: number;
  /** User + system CPU time of the build process (all its threads), from process.cpuUsage. */
  cpuSeconds: number;
  peakRssMB: number;
  ceilingMB: number;
  onDisk: boolean;
  reportedPeakMB: number | null;
  accuracy: number;
  flags: string[];
}

/** Generates the file and builds it with the default settings (plus `flags`) in a child process. */
export async function runDefaultBuildMemory(targetBytes = 100 * 1024 * 1024, flags: string[] = []): Promise<DefaultBuildMemoryResult> {
  const directory = mkdtempSync(join(tmpdir(), "sluice-memory-"));
  try {
    const data = join(directory, "short-texts.csv");
    const lines = await writeShortTextCsv(data, targetBytes);
    const started = performance.now();
    const script = `import { register } from "tsx/esm/api"; register(); const { main } = await import(${JSON.stringify(pathToFileURL(join(root, "compiler/cli/main.ts")).href)}); const code = await main(${JSON.stringify(["build", data, "--out", join(directory, "model.sluice"), "--json", "--quiet", ...flags])}); const cpu = process.cpuUsage(); process.stderr.write("PEAK_RSS_KB=" + process.resourceUsage().maxRSS + " CPU_US=" + (cpu.user + cpu.system) + "\\n"); process.exitCode = code;`;
    const child = spawnSync(process.execPath, ["--input-type=module", "-e", script], { cwd: root, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
    const seconds = (performance.now() - started) / 1000;
    if (child.status !== 0) throw new Error(`default build failed (${child.status}): ${child.stderr.slice(-2000)}`);
    const peak = /PEAK_RSS_KB=(\d+)/.exec(child.stderr);
    const cpu = /CPU_US=(\d+)/.exec(child.stderr);
    const report = JSON.parse(child.stdout.trim().split("\n").pop() as string) as { compiled: { accuracy: number }; onDisk?: boolean; peakMemoryBytes?: number };
    const fileBytes = statSync(data).size;
    return {
      fileBytes,
      lines,
      seconds,
      cpuSeconds: cpu ? Number(cpu[1]) / 1e6 : NaN,
      peakRssMB: peak ? Number(peak[1]) / 1024 : NaN,
      ceilingMB: (2 * fileBytes) / 1024 ** 2 + 300,
      onDisk: report.onDisk === true,
      reportedPeakMB: typeof report.peakMemoryBytes === "number" ? report.peakMemoryBytes / 1024 ** 2 : null,
      accuracy: report.compiled.accuracy,
      flags,
    };
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

/** The flags of the forced in-memory build: a budget no projection reaches. */
export const IN_MEMORY_FLAGS = ["--max-memory", "64g"];

/** One line about one build. */
export function describeDefaultBuildMemory(result: DefaultBuildMemoryResult): string {
  return `${(result.fileBytes / 1024 ** 2).toFixed(1)} MB CSV, ${result.lines} lines, flags [${result.flags.join(" ")}]: ${result.onDisk ? "on disk" : "in memory"}, ${result.seconds.toFixed(1)} s wall, ${result.cpuSeconds.toFixed(1)} s CPU, peak RSS ${result.peakRssMB.toFixed(0)} MB (ceiling 2 × input + 300 = ${result.ceilingMB.toFixed(0)} MB), accuracy ${result.accuracy.toFixed(4)}`;
}

/** The default build's time as a multiple of the in-memory build's (the target is at most 1.10). */
export function describeBuildPathCost(chosen: DefaultBuildMemoryResult, inMemory: DefaultBuildMemoryResult): string {
  const path = chosen.onDisk ? "on disk" : "in memory";
  return `the projection's path (${path}) against in memory: ${(chosen.seconds / inMemory.seconds).toFixed(2)}× the wall time, ${(chosen.cpuSeconds / inMemory.cpuSeconds).toFixed(2)}× the CPU time, ${(chosen.peakRssMB / inMemory.peakRssMB).toFixed(2)}× the peak RSS`;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const at = process.argv.indexOf("--mb");
  const mb = at < 0 ? 100 : Number(process.argv[at + 1]);
  const dashes = process.argv.indexOf("--");
  const runs = dashes < 0 ? [[], IN_MEMORY_FLAGS] : [process.argv.slice(dashes + 1)];
  const results: DefaultBuildMemoryResult[] = [];
  for (const flags of runs) {
    const result = await runDefaultBuildMemory(mb * 1024 * 1024, flags);
    results.push(result);
    console.log(JSON.stringify(result));
    console.log(describeDefaultBuildMemory(result));
  }
  if (results.length === 2) console.log(describeBuildPathCost(results[0], results[1]));
}
