#!/usr/bin/env node
// Node 20 cannot run TypeScript itself: register the tsx loader, then hand over to the CLI.
import { register } from "tsx/esm/api";
register();
const { main } = await import("../compiler/cli/main.ts");
process.exitCode = await main(process.argv.slice(2));
