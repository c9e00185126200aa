// `sluice traffic-report <model> --stats stats.json [--shadow shadow.json] --out traffic.html`:
// the Worker's traffic counts and shadow comparison (saved from GET /v1/stats and
// GET /v1/shadow) as one self-contained HTML page. Parses flags and does the I/O only.

import { readFileSync } from "node:fs";
import { renderTrafficReport, type ShadowExport, type StatsExport } from "../../report/traffic-report.ts";
import { optionsOf } from "../command-table.ts";
import { checkInputFiles } from "../input-path.ts";
import { loadModelFile } from "../load-model-file.ts";
import { checkOutputPath } from "../output-path.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

const OPTIONS = optionsOf("traffic-report");

function readJson<T>(path: string, what: string, check: (value: Record<string, unknown>) => boolean): T {
  let value: unknown;
  try {
    value = JSON.parse(readFileSync(path, "utf8"));
  } catch (error) {
    throw new Error(`${path}: expected the JSON answer of ${what}, but it cannot be read as JSON (${(error as Error).message})`);
  }
  if (typeof value !== "object" || value === null || !check(value as Record<string, unknown>)) throw new Error(`${path}: expected the JSON answer of ${what}; its fields are missing`);
  return value as T;
}

/** Runs the traffic-report command; returns the exit code. */
export async function trafficReportCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, OPTIONS);
  if (args.positionals.length !== 1) throw new UsageError("traffic-report needs the live model file: sluice traffic-report <model> --stats stats.json [--shadow shadow.json]");
  const statsPath = valueOf(args, "--stats");
  const shadowPath = valueOf(args, "--shadow");
  if (statsPath === undefined && shadowPath === undefined) throw new UsageError("traffic-report needs --stats (GET /v1/stats) or --shadow (GET /v1/shadow), or both");
  const out = valueOf(args, "--out") ?? "traffic.html";
  const force = args.switches.get("--force") === true;
  checkInputFiles([[args.positionals[0], "model file"], [statsPath, "--stats file"], [shadowPath, "--shadow file"]]);
  checkOutputPath(out, { inputs: [args.positionals[0], statsPath, shadowPath], force });
  const model = loadModelFile(args.positionals[0]);
  const stats = statsPath === undefined ? null : readJson<StatsExport>(statsPath, "GET /v1/stats", (v) => Array.isArray(v.hours));
  const shadow = shadowPath === undefined ? null : readJson<ShadowExport>(shadowPath, "GET /v1/shadow", (v) => Array.isArray(v.cells) && typeof v.total === "number");
  const html = renderTrafficReport(model, stats, shadow, new Date().toISOString());
  writeFileAtomic(out, html, { force });
  if (args.switches.get("--quiet") !== true) process.stderr.write(`wrote ${out}: ${Buffer.byteLength(html)} bytes\n`);
  return 0;
}
