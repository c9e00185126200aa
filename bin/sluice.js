#!/usr/bin/env node
// The installed package runs the compiled CLI in lib/. A source checkout (the TypeScript
// sources are beside this file and tsx is installed) runs the sources through tsx instead,
// so `npx sluice` in the repository never runs compiled code older than the sources.
import { existsSync } from "node:fs";

const source = new URL("../compiler/cli/main.ts", import.meta.url);
const cli = existsSync(source) ? await sourceCli(source) : null;
const { main } = cli ?? (await import("../lib/compiler/cli/main.js"));
process.exitCode = await main(process.argv.slice(2));

/** The CLI from the sources through tsx, or null when tsx is not installed (production install of a checkout). */
async function sourceCli(url) {
  let register;
  try {
    ({ register } = await import("tsx/esm/api"));
  } catch {
    return null;
  }
  register();
  return import(url.href);
}
