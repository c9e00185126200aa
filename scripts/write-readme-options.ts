// Rewrites README's generated CLI reference from compiler/cli/command-table.ts
// (`npm run readme:options`); test/cli/readme-options.test.ts fails when README is stale.
import { readFileSync, writeFileSync } from "node:fs";
import { spliceReadme } from "../compiler/cli/help-text.ts";

const path = new URL("../README.md", import.meta.url);
const before = readFileSync(path, "utf8");
const after = spliceReadme(before);
if (after === before) console.log("README.md: CLI reference is up to date");
else {
  writeFileSync(path, after);
  console.log("README.md: CLI reference rewritten from the command table");
}
