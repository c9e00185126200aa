// README's walk, as a newcomer runs it, in one fresh temporary folder: setup → demo → build a
// CSV of your own → eval → tune → build with tune's config → serve and curl every README call
// → report. The folder gets a copy of the project's files; "setup" links the installed
// node_modules instead of a second `npm ci` (CI runs the real setup from a clean clone).
import { execFile, spawn } from "node:child_process";
import { cpSync, existsSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { parse } from "csv-parse/sync";
import { afterAll, describe, expect, it } from "vitest";
import { REPO } from "./run-sluice.ts";

const exec = promisify(execFile);
const folder = mkdtempSync(join(tmpdir(), "sluice-walk-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const sluice = (...args: string[]) => exec(process.execPath, ["bin/sluice.js", ...args], { cwd: folder, maxBuffer: 64 * 1024 * 1024 });

/** The curl lines between README's markers. */
function readmeCurlCalls(): string[] {
  const readme = readFileSync(join(REPO, "README.md"), "utf8");
  const block = readme.slice(readme.indexOf("<!-- curl calls:"), readme.indexOf("<!-- end of curl calls -->"));
  return block.split("\n").filter((line) => line.startsWith("curl "));
}

describe("README's walk in a fresh folder", () => {
  it("should run setup, demo, build, eval, tune, build with tune's config, serve with curl, and report", async () => {
    // setup
    for (const part of ["bin", "compiler", "runtime", "scripts", "demo-data", "package.json", "tsconfig.json"]) cpSync(join(REPO, part), join(folder, part), { recursive: true, filter: (path) => !path.includes(`${join("demo-data", "models")}`) });
    symlinkSync(join(REPO, "node_modules"), join(folder, "node_modules"));

    // demo
    const demo = await exec("npm", ["run", "-s", "demo"], { cwd: folder, maxBuffer: 64 * 1024 * 1024 });
    expect(demo.stdout).toContain("$ sluice classify demo-data/models/contact-form.sluice");
    expect(existsSync(join(folder, "demo-data/models/support-topics.sluice"))).toBe(true);

    // a CSV of one's own: an invented help desk (columns of its own names), split by line
    const records = (parse(readFileSync(join(REPO, "demo-data/support-topics.csv")), { columns: true }) as Record<string, string>[]).slice(0, 1800);
    const csv = (part: Record<string, string>[]) => `queue,subject,body\n${part.map((r) => [r.topic, r.subject, r.body].map(quote).join(",")).join("\n")}\n`;
    writeFileSync(join(folder, "data.csv"), csv(records.slice(0, 1500)));
    writeFileSync(join(folder, "test.csv"), csv(records.slice(1500)));
    await sluice("build", "data.csv", "--text-field", "subject,body", "--label-field", "queue", "--max-bytes", "128k", "--out", "topics.sluice", "--quiet");
    const evaluation = JSON.parse((await sluice("eval", "topics.sluice", "test.csv", "--json", "--quiet")).stdout);
    expect(evaluation.examples).toBe(300);

    // tune, then the build command it prints
    const tune = await sluice("tune", "data.csv", "--text-field", "subject,body", "--label-field", "queue", "--time", "20s", "--trials", "3", "--max-bytes", "128k", "--out", "sluice.config.json", "--quiet");
    const printed = /build with: sluice (build .*)$/m.exec(tune.stdout);
    expect(printed, tune.stdout).not.toBeNull();
    await sluice(...(printed as RegExpExecArray)[1].split(" "), "--out", "tuned.sluice", "--quiet");

    // serve, and every curl call of README
    const server = spawn(process.execPath, ["bin/sluice.js", "serve", "tuned.sluice", "--port", "0"], { cwd: folder, stdio: ["ignore", "pipe", "pipe"] });
    try {
      const url = await new Promise<string>((resolve, reject) => {
        let output = "";
        server.stdout.setEncoding("utf8").on("data", (chunk: string) => {
          output += chunk;
          const found = /on (http:\/\/127\.0\.0\.1:\d+)/.exec(output)?.[1];
          if (found) resolve(found);
        });
        server.once("exit", (code) => reject(new Error(`serve exited with ${code}: ${output}`)));
      });
      const calls = readmeCurlCalls();
      expect(calls.length).toBeGreaterThanOrEqual(8);
      for (const call of calls) {
        const { stdout } = await exec("bash", ["-c", `${call.replace("http://127.0.0.1:8787", url)} -f`], { cwd: folder });
        if (call.includes("-o playground.html")) expect(readFileSync(join(folder, "playground.html"), "utf8")).toContain("<html");
        else expect(() => JSON.parse(stdout), call).not.toThrow();
        if (call.includes("/v1/moderate")) expect(["allow", "review", "block", "route"]).toContain(JSON.parse(stdout).action);
      }
    } finally {
      server.kill("SIGTERM");
    }

    // report
    await sluice("report", "tuned.sluice", "test.csv", "--out", "report.html", "--quiet");
    expect(readFileSync(join(folder, "report.html"), "utf8")).toContain("<!doctype html>");
  }, 300_000);
});

/** One CSV field, quoted with inner quotes doubled (RFC 4180 §2 items 6 and 7). */
function quote(field: string): string {
  return `"${field.replace(/"/g, '""')}"`;
}
