// A linear draft (--linear, draft.ts) has one row value per output and an identity output
// layer, so its dims are the output count whatever --dims said. Every stage that sizes rows
// (the budget, the latency estimate, the header) reads settings.dims, so the settings are made
// consistent once, here, instead of each stage asking about `linear`.

import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { BuildSettings } from "./build-settings.ts";

/**
 * The settings with dims set to the output count when `linear` is on; unchanged otherwise.
 * The tree head scores inner nodes from a hidden vector, so it cannot have logit rows.
 * @example withLinearDims({ ...settings, linear: true }, "softmax", 26).dims // 26
 */
export function withLinearDims(settings: BuildSettings, head: HeadKind, labelCount: number): BuildSettings {
  if (!settings.linear) return settings;
  if (head === "tree") throw new Error("--linear needs a softmax or sigmoid head (the tree head scores its inner nodes from a hidden vector); use --head softmax or leave --linear off");
  return settings.dims === labelCount ? settings : { ...settings, dims: labelCount };
}
