// Folding the output layer into the rows is exact algebra: P = O · row per feature, and the
// mean of the P rows equals O applied to the mean of the rows (linearity of the matrix
// product; common practice, no source). So a float32 model with logit rows must score like
// the same draft with hidden rows, and the int8 one must stay within quantization error.
import { describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../../compiler/build/build-settings.ts";
import { foldOutputLayer, shouldFoldOutput } from "../../../compiler/compile/fold-output.ts";
import { loadModel } from "../../../runtime/index.ts";
import { readExamples } from "../../../compiler/read/index.ts";

describe("foldOutputLayer", () => {
  it("multiplies every row by the output layer (a worked 2×3 by 3×2 product)", () => {
    // rows: [1, 2, 3] and [0, -1, 4]; outputs (2 × 3): [1, 0, 1] and [2, 1, 0].
    // Row 1: [1+3, 2+2] = [4, 4]; row 2: [0+4, 0-1] = [4, -1] (worked by hand).
    const folded = foldOutputLayer(new Float32Array([1, 2, 3, 0, -1, 4]), new Float32Array([1, 0, 1, 2, 1, 0]), 3, 2);
    expect(Array.from(folded)).toEqual([4, 4, 4, -1]);
  });

  it("is used only when it makes rows narrower, and never for the tree head", () => {
    expect(shouldFoldOutput(true, "softmax", 6, 24)).toBe(true);
    expect(shouldFoldOutput(true, "sigmoid", 3, 16)).toBe(true);
    expect(shouldFoldOutput(true, "softmax", 24, 24)).toBe(false);
    expect(shouldFoldOutput(true, "tree", 5, 24)).toBe(false);
    expect(shouldFoldOutput(false, "softmax", 2, 24)).toBe(false);
  });
});

describe("a build with logit rows", () => {
  async function topics() {
    const examples = [];
    for await (const e of readExamples(new URL("../../../demo-data/support-topics.csv", import.meta.url).pathname, { textFields: ["subject", "body"], labelField: "topic" })) {
      examples.push({ text: e.text, labels: e.labels });
      if (examples.length === 1500) break;
    }
    return examples;
  }
  const settings = (overrides: Partial<BuildSettings>): BuildSettings => ({ ...defaultBuildSettings(), epochs: 3, fingerprint: false, searchTime: 0, ...overrides });

  it("scores exactly like hidden rows when both are float32", async () => {
    const examples = await topics();
    const hidden = loadModel((await build({ examples, settings: settings({ precision: "float32", foldOutput: false }), buildTime: "2026-01-01T00:00:00.000Z" })).bytes);
    const folded = loadModel((await build({ examples, settings: settings({ precision: "float32" }), buildTime: "2026-01-01T00:00:00.000Z" })).bytes);
    expect(hidden.meta.rowSpace).toBe("hidden");
    expect(folded.meta.rowSpace).toBe("logits");
    expect(folded.meta.rowCount).toBe(hidden.meta.rowCount);
    let largest = 0;
    for (const { text } of examples.slice(0, 300)) {
      const a = hidden.score(text).scores;
      const b = folded.score(text).scores;
      for (let k = 0; k < a.length; k++) largest = Math.max(largest, Math.abs(a[k] - b[k]));
    }
    expect(largest).toBeLessThan(1e-5); // float32 rounding of the products only
  });

  it("stores fewer bytes per row and agrees with the int8 hidden-row model on nearly every text", async () => {
    const examples = await topics();
    const hiddenBuild = await build({ examples, settings: settings({ foldOutput: false }), buildTime: "2026-01-01T00:00:00.000Z" });
    const foldedBuild = await build({ examples, settings: settings({}), buildTime: "2026-01-01T00:00:00.000Z" });
    expect(foldedBuild.report.sections.rows).toBe(foldedBuild.report.rows.kept * 6); // 6 labels, one byte each
    expect(hiddenBuild.report.sections.rows).toBe(hiddenBuild.report.rows.kept * 24); // dims 24
    expect(foldedBuild.bytes.length).toBeLessThan(hiddenBuild.bytes.length / 2);
    const hidden = loadModel(hiddenBuild.bytes);
    const folded = loadModel(foldedBuild.bytes);
    let disagreements = 0;
    for (const { text } of examples.slice(0, 500)) if (hidden.classify(text)[0].label !== folded.classify(text)[0].label) disagreements++;
    expect(disagreements).toBeLessThanOrEqual(5); // two different 8-bit roundings of the same draft
  });
});
