// Which output layer a build uses when the settings say `--head auto`.

import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { BuildSettings } from "./build-settings.ts";

/** Above this many labels `--head auto` picks the tree head (measured: see README, "Scale"). */
export const TREE_HEAD_LABEL_THRESHOLD = 64;

/** The head for `--head auto`: sigmoid for several labels per example, tree for many labels. */
export function chooseHead(choice: BuildSettings["head"], severalLabels: boolean, labelCount: number): { head: HeadKind; reason: string } {
  if (choice !== "auto") return { head: choice, reason: "chosen by --head" };
  if (severalLabels) return { head: "sigmoid", reason: "some examples carry several labels" };
  if (labelCount > TREE_HEAD_LABEL_THRESHOLD) return { head: "tree", reason: `${labelCount} labels, more than ${TREE_HEAD_LABEL_THRESHOLD}` };
  return { head: "softmax", reason: `one label per example, ${labelCount} labels` };
}
