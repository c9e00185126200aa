// `sluice eval <model> <data>`: metrics on labelled data, as a table or one JSON object.

import { evaluateModel } from "../../evaluate.ts";
import { fixed, formatTable } from "../format-table.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { parseArgs, UsageError, type FlagSpec } from "../parse-args.ts";
import { DATA_FLAGS, readData } from "../read-data.ts";

export const EVAL_FLAGS: Record<string, FlagSpec> = {
  ...DATA_FLAGS,
  "--json": { takesValue: false, description: "print one JSON object on stdout" },
  "--quiet": { takesValue: false, description: "no messages on stderr" },
};

/** Runs the eval command; returns the exit code. */
export async function evalCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, EVAL_FLAGS);
  if (args.positionals.length !== 2) throw new UsageError("eval needs a model and a data file: sluice eval <model> <data>");
  const [modelPath, dataPath] = args.positionals;
  const quiet = args.switches.get("--quiet") === true;
  const model = loadModelFile(modelPath);
  const { examples } = await readData(dataPath, args, fieldsOf(model), true, quiet);
  const report = evaluateModel(model, examples);
  if (report.unknownLabelExamples > 0) {
    process.stderr.write(`warning: ${report.unknownLabelExamples} examples have labels the model does not know (${report.unknownLabels.slice(0, 5).join(", ")}); they are left out\n`);
  }
  if (args.switches.get("--json") === true) {
    process.stdout.write(`${JSON.stringify(report)}\n`);
    return 0;
  }
  const rows = Object.entries(report.labels).map(([label, s]) => [label, fixed(s.precision), fixed(s.recall), fixed(s.f1), s.support]);
  process.stdout.write(
    [
      `${dataPath}: ${report.examples} examples, model ${model.meta.version}`,
      `accuracy ${fixed(report.accuracy)}  macro-F1 ${fixed(report.macroF1)}  micro-F1 ${fixed(report.microF1)}  log-loss ${fixed(report.logLoss)}  ECE ${fixed(report.ece)}  ${report.usPerDoc.toFixed(1)} µs/doc`,
      "",
      formatTable(["label", "precision", "recall", "f1", "support"], rows),
      "",
      "confusion (rows: gold, columns: predicted)",
      formatTable(["gold \\ predicted", ...report.confusionLabels], report.confusion.map((row, i) => [report.confusionLabels[i], ...row])),
    ].join("\n") + "\n",
  );
  return 0;
}
