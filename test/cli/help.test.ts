// `sluice <command> --help` lists the options from the same table the parser uses, so an
// option cannot exist without appearing in the help.
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { BUILD_SETTINGS } from "../../compiler/build/build-settings.ts";

const run = promisify(execFile);

describe("sluice --help", () => {
  it("should list every build setting with its description", async () => {
    const { stdout } = await run(process.execPath, ["bin/sluice.js", "build", "--help"]);
    for (const spec of Object.values(BUILD_SETTINGS)) {
      expect(stdout).toContain(spec.flag);
      expect(stdout).toContain(spec.description);
    }
  });

  it("should list the commands when run without one, and exit non-zero", async () => {
    const result = await run(process.execPath, ["bin/sluice.js"]).catch((error: { code: number; stdout: string }) => error);
    expect((result as { code: number }).code).toBe(1);
    for (const command of ["build", "eval", "classify", "explain", "inspect", "compare", "report", "serve", "tune"]) expect((result as { stdout: string }).stdout).toContain(command);
  });
});
