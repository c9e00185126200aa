// `sluice report <model> <data> --out report.html`: one self-contained HTML page with the
// model's charts and tables on labelled data. This file only parses flags and does the I/O;
// the page comes from the pure renderReport.

import { basename } from "node:path";
import { evaluateModel } from "../../evaluate/evaluate.ts";
import { readFileSync } from "node:fs";
import { renderEvasionReport, type EvasionResultsFile } from "../../report/evasion-report.ts";
import { renderReport } from "../../report/render-report.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf, type ParsedArgs } from "../parse-args.ts";
import { readData, sha256OfFile } from "../read-data.ts";
import { checkInputFile, checkInputFiles } from "../input-path.ts";
import { checkOutputPath } from "../output-path.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

const REPORT_OPTIONS = optionsOf("report");

/** Runs the report command; returns the exit code. */
export async function reportCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, REPORT_OPTIONS);
  const evasion = valueOf(args, "--evasion");
  if (evasion !== undefined) return evasionReport(args, evasion);
  if (args.positionals.length !== 2) throw new UsageError("report needs a model and a labelled data file: sluice report <model> <data> --out report.html");
  const [modelPath, dataPath] = args.positionals;
  const out = valueOf(args, "--out") ?? "report.html";
  const force = args.switches.get("--force") === true;
  const quiet = args.switches.get("--quiet") === true;
  checkInputFiles([[modelPath, "model file"], [dataPath, "data file"]]);
  checkOutputPath(out, { inputs: [modelPath, dataPath], force });
  const model = loadModelFile(modelPath);
  const { examples } = await readData(dataPath, args, fieldsOf(model), true, quiet);
  const evaluation = evaluateModel(model, examples);
  if (evaluation.unknownLabelExamples > 0 && !quiet) {
    process.stderr.write(`warning: ${evaluation.unknownLabelExamples} examples have labels the model does not know (${evaluation.unknownLabels.slice(0, 5).join(", ")}); they are left out\n`);
  }
  const html = renderReport(model, examples, evaluation, {
    dataName: dataPath === "-" ? "stdin" : basename(dataPath),
    dataSha256: dataPath === "-" ? undefined : await sha256OfFile(dataPath),
    generatedAt: new Date().toISOString(),
  });
  writeFileAtomic(out, html, { force });
  if (!quiet) process.stderr.write(`wrote ${out}: ${Buffer.byteLength(html)} bytes, ${evaluation.examples} examples, accuracy ${evaluation.accuracy.toFixed(3)}\n`);
  return 0;
}

/** `report --evasion results.json`: the evasion suite's results as a page. */
function evasionReport(args: ParsedArgs, resultsPath: string): number {
  if (args.positionals.length !== 0) throw new UsageError("report --evasion takes the results file only: sluice report --evasion test/bench/results/evasion.json --out evasion.html");
  const out = valueOf(args, "--out") ?? "evasion.html";
  const force = args.switches.get("--force") === true;
  checkInputFile(resultsPath, "evasion results file");
  checkOutputPath(out, { inputs: [resultsPath], force });
  let results: EvasionResultsFile;
  try {
    const file = JSON.parse(readFileSync(resultsPath, "utf8")) as { name?: string; data?: EvasionResultsFile };
    if (file.name !== "evasion" || !Array.isArray(file.data?.cells) || !Array.isArray(file.data?.datasets)) throw new Error("no evasion results in it (fields name, data.cells, data.datasets)");
    results = file.data as EvasionResultsFile;
  } catch (error) {
    throw new Error(`${resultsPath}: expected the evasion suite's results (npm run bench:evasion writes test/bench/results/evasion.json): ${(error as Error).message}`);
  }
  const html = renderEvasionReport(results, new Date().toISOString());
  writeFileAtomic(out, html, { force });
  if (args.switches.get("--quiet") !== true) process.stderr.write(`wrote ${out}: ${Buffer.byteLength(html)} bytes, ${results.cells.length} measurements\n`);
  return 0;
}
