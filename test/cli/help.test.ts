// Every command's --help and README's CLI reference come from compiler/cli/command-table.ts,
// so an option cannot exist without appearing, with its default and allowed values, in both.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { BUILD_SETTINGS } from "../../compiler/build/build-settings.ts";
import { COMMAND_TABLE, optionsOf, type CommandName } from "../../compiler/cli/command-table.ts";
import { optionSyntax, spliceReadme } from "../../compiler/cli/help-text.ts";
import { REPO, sluice } from "./run-sluice.ts";

const COMMANDS = Object.keys(COMMAND_TABLE) as CommandName[];
const README = readFileSync(`${REPO}/README.md`, "utf8");

describe("sluice --help", () => {
  it("should list every build setting with its description, default and allowed values", async () => {
    const { stdout, code } = await sluice(["build", "--help"]);
    expect(code).toBe(0);
    for (const spec of Object.values(BUILD_SETTINGS)) {
      expect(stdout).toContain(spec.description);
      if (spec.kind === "enum") expect(stdout).toContain(`${spec.flag} ${spec.values?.join("|")}`);
      else expect(stdout).toContain(spec.kind === "boolean" ? `--[no-]${spec.flag.slice(2)}` : spec.flag);
    }
    expect(stdout).toMatch(/--precision int8\|float32 +storage of rows and output weights \(default int8\)/);
  });

  it("should print every command's help in the one layout, each option with its default", async () => {
    for (const name of COMMANDS) {
      const { stdout, code } = await sluice([name, "--help"]);
      expect(code, name).toBe(0);
      expect(stdout.startsWith(`usage: sluice ${name} `), name).toBe(true);
      expect(stdout).toContain("exit codes:\n  0  success");
      for (const [flag, spec] of Object.entries(optionsOf(name))) {
        if (flag === "--help") continue;
        expect(stdout, `${name} ${flag}`).toContain(optionSyntax(flag, spec));
        if (spec.default !== undefined) expect(stdout, `${name} ${flag}`).toContain(`(default ${spec.default})`);
      }
    }
    // One CLI start per command (ten of them), each several seconds on a busy 2-core machine.
  }, 180_000);

  it("should exit 2, as bad usage, when run without a command, listing the commands on stderr", async () => {
    const result = await sluice([]);
    expect(result.code).toBe(2);
    for (const command of COMMANDS) expect(result.stderr).toContain(`  ${command} `);
  });

  it("should exit 2 for an unknown command and for an unknown option, and 0 for --help", async () => {
    expect((await sluice(["predict"])).code).toBe(2);
    const unknown = await sluice(["eval", "m.sluice", "d.csv", "--colour"]);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/unknown option --colour/);
    expect((await sluice(["--help"])).code).toBe(0);
  });

  it("should refuse a value outside an option's allowed values, naming them", async () => {
    const result = await sluice(["build", "x.csv", "--precision", "int4"]);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('--precision: expected int8 or float32, got "int4"');
  });
});

describe("README's CLI reference", () => {
  it("should be exactly what the command table generates (run npm run readme:options)", () => {
    expect(spliceReadme(README)).toBe(README);
  });

  it("should name every option of every command, including the build settings", () => {
    for (const name of COMMANDS) for (const [flag, spec] of Object.entries(optionsOf(name))) if (flag !== "--help") expect(README, `${name} ${flag}`).toContain(`\`${optionSyntax(flag, spec).replace(/\|/g, "\\|")}\``);
    for (const flag of ["--fine-tune-epochs N", "--hash-seed N", "--max-tokens N"]) expect(README).toContain(`\`${flag}\``);
  });
});
