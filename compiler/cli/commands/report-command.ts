// `sluice report <model> <data> --out report.html`: one self-contained HTML page with the
// model's charts and tables on labelled data. This file only parses flags and does the I/O;
// the page comes from the pure renderReport.

import { basename } from "node:path";
import { evaluateModel } from "../../evaluate/evaluate.ts";
import { renderReport } from "../../report/render-report.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";
import { readData, sha256OfFile } from "../read-data.ts";
import { checkInputFile, checkOutputPath } from "../output-path.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

const REPORT_OPTIONS = optionsOf("report");

/** Runs the report command; returns the exit code. */
export async function reportCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, REPORT_OPTIONS);
  if (args.positionals.length !== 2) throw new UsageError("report needs a model and a labelled data file: sluice report <model> <data> --out report.html");
  const [modelPath, dataPath] = args.positionals;
  const out = valueOf(args, "--out") ?? "report.html";
  const force = args.switches.get("--force") === true;
  const quiet = args.switches.get("--quiet") === true;
  checkInputFile(dataPath, "data file");
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
