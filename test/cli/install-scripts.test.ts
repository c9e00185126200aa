// Every dependency that ships an install script is decided in package.json's allowScripts
// (npm 11.16+, `npm install-scripts`; docs.npmjs.com, "npm-install-scripts"), so setup prints
// no "not yet covered by allowScripts" warning, and README says what each decision is.
import { execFile } from "node:child_process";
import { readFileSync } from "node:fs";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { REPO } from "./run-sluice.ts";

const run = promisify(execFile);

describe("install scripts", () => {
  it("should leave no dependency's install script undecided", async () => {
    const { stdout } = await run("npm", ["install-scripts", "ls"], { cwd: REPO });
    expect(stdout).toContain("No packages with unreviewed install scripts");
  }, 60_000);

  it("should explain in README every package allowScripts names", () => {
    const allow = JSON.parse(readFileSync(`${REPO}/package.json`, "utf8")).allowScripts as Record<string, boolean>;
    const readme = readFileSync(`${REPO}/README.md`, "utf8");
    for (const [name, allowed] of Object.entries(allow)) expect(readme).toMatch(new RegExp(`\`${name}\`[^\\n]*${allowed ? "runs" : "skipped"}`));
  });
});
