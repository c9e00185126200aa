// Output paths are checked before any reading or training, for build, tune --out and
// report --out: the output is never one of the inputs (compared after symlinks and ./),
// its folder must exist and take a file, messages name the user's path (not a temporary
// file), and a killed build's temporary file is removed by the next run. traffic-report's
// --out gets the same checks.
import { createHash } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { removeStaleTemporaryFiles, writeFileAtomic } from "../../compiler/cli/write-file-atomic.ts";
import { REPO, sluice } from "./run-sluice.ts";

let folder: string;
let data: string;
const sha = (path: string) => createHash("sha256").update(readFileSync(path)).digest("hex");
/** A path as the user would type it from the repo root (where the CLI runs). */
const typed = (path: string) => relative(REPO, path);

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), "sluice-out-"));
  data = join(folder, "x.csv");
  const rows = ["text,label"];
  for (let i = 0; i < 40; i++) rows.push(`refund my card payment ${i},billing`, `where is my parcel ${i},shipping`);
  writeFileSync(data, `${rows.join("\n")}\n`);
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe("sluice build output paths", () => {
  it("should refuse --out equal to the data file, even with --force, and leave the data intact", async () => {
    const before = sha(data);
    const run = await sluice(["build", typed(data), "--out", typed(data), "--force", "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain("is the input file");
    expect(run.stdout).toBe(""); // nothing was trained or written
    expect(sha(data)).toBe(before);
  });

  it("should refuse another spelling of the data file: ./, .. and a symlink", async () => {
    const link = join(folder, "link.csv");
    symlinkSync(data, link);
    mkdirSync(join(folder, "sub"), { recursive: true });
    for (const out of [`${typed(folder)}/./x.csv`, `${typed(folder)}/sub/../x.csv`, typed(link)]) {
      const run = await sluice(["build", typed(data), "--out", out, "--force", "--quiet"]);
      expect(run.code).toBe(1);
      expect(run.stderr).toContain("is the input file");
    }
  });

  it("should refuse --out equal to the validation or config file", async () => {
    const config = join(folder, "settings.json");
    writeFileSync(config, "{}\n");
    const viaValidation = await sluice(["build", typed(data), "--validation", typed(data), "--out", typed(data), "--force", "--quiet"]);
    expect(viaValidation.stderr).toContain("is the input file");
    const viaConfig = await sluice(["build", typed(data), "--config", typed(config), "--out", typed(config), "--force", "--quiet"]);
    expect(viaConfig.code).toBe(1);
    expect(viaConfig.stderr).toContain(`is the input file ${typed(config)}`);
    expect(readFileSync(config, "utf8")).toBe("{}\n");
  });

  it("should refuse an output folder that does not exist before training, naming the user's path", async () => {
    const out = `${typed(folder)}/nodir/sub/o10.sluice`;
    const run = await sluice(["build", typed(data), "--out", out, "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`--out ${out}: the folder ${typed(folder)}/nodir/sub does not exist`);
    expect(run.stderr).not.toContain(".tmp");
    expect(run.stdout).toBe("");
  });

  it("should refuse --out equal to an --also file", async () => {
    const also = join(folder, "also.csv");
    writeFileSync(also, "text,label\nrefund please,billing\n");
    const before = sha(also);
    const run = await sluice(["build", typed(data), "--also", typed(also), "--out", typed(also), "--force", "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`is the input file ${typed(also)}`);
    expect(sha(also)).toBe(before);
  });

  it("should refuse a folder it cannot create files in before reading the data", async () => {
    // Permissions do not stop root, so as root the folder is /sys/kernel: sysfs refuses to
    // create regular files whoever asks (EACCES, measured on this Linux machine).
    let readOnly = join(folder, "read-only");
    if (process.getuid?.() === 0) readOnly = "/sys/kernel";
    else {
      mkdirSync(readOnly);
      chmodSync(readOnly, 0o555);
    }
    const out = join(readOnly, "m.sluice");
    const run = await sluice(["build", typed(data), "--out", out]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`--out ${out}: cannot create a file in ${readOnly} (permission denied)`);
    expect(run.stderr).not.toContain("rows →"); // the data was never read
  });

  it("should refuse an output that is a folder", async () => {
    const run = await sluice(["build", typed(data), "--out", typed(folder), "--force", "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain("is a folder; give a file name");
  });

  it("should name a data path that is a folder instead of a bare EISDIR", async () => {
    const run = await sluice(["build", typed(folder), "--out", `${typed(folder)}/m.sluice`, "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`data file ${typed(folder)} is a folder, not a file`);
    expect(run.stderr).not.toContain("EISDIR");
  });

  it("should remove a killed build's temporary file on the next run and write the model", async () => {
    const out = join(folder, "m.sluice");
    // A pid above Linux's pid_max ceiling of 2^22 (proc(5), /proc/sys/kernel/pid_max) never runs.
    const stale = join(folder, ".m.sluice.4194305.1796222625219.tmp");
    writeFileSync(stale, "half a model");
    const run = await sluice(["build", typed(data), "--out", typed(out), "--epochs", "1", "--quiet"]);
    expect(run.code).toBe(0);
    expect(existsSync(stale)).toBe(false);
    expect(existsSync(out)).toBe(true);
  });
});

describe("sluice tune and report output paths", () => {
  it("should refuse tune --out equal to its data file", async () => {
    const run = await sluice(["tune", typed(data), "--out", typed(data), "--force", "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain("is the input file");
  });

  it("should refuse tune --out spelled through a symlink to its data, and a missing folder, before tuning", async () => {
    const link = join(folder, "tune-link.csv");
    symlinkSync(data, link);
    const viaLink = await sluice(["tune", typed(data), "--out", typed(link), "--force"]);
    expect(viaLink.code).toBe(1);
    expect(viaLink.stderr).toContain("is the input file");
    const out = `${typed(folder)}/nodir/t.json`;
    const missing = await sluice(["tune", typed(data), "--out", out]);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toContain(`--out ${out}: the folder ${typed(folder)}/nodir does not exist`);
    expect(missing.stderr).not.toContain("rows →");
  });

  it("should refuse report --out spelled ./ for the data, and a missing folder", async () => {
    const model = join(folder, "m.sluice");
    if (!existsSync(model)) expect((await sluice(["build", typed(data), "--out", typed(model), "--epochs", "1", "--quiet"])).code).toBe(0);
    const viaDot = await sluice(["report", typed(model), typed(data), "--out", `${typed(folder)}/./x.csv`, "--force"]);
    expect(viaDot.code).toBe(1);
    expect(viaDot.stderr).toContain("is the input file");
    const out = `${typed(folder)}/nodir/r.html`;
    const missing = await sluice(["report", typed(model), typed(data), "--out", out]);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toContain(`--out ${out}: the folder ${typed(folder)}/nodir does not exist`);
  });

  it("should refuse traffic-report --out equal to its --stats file", async () => {
    const model = join(folder, "m.sluice");
    if (!existsSync(model)) expect((await sluice(["build", typed(data), "--out", typed(model), "--epochs", "1", "--quiet"])).code).toBe(0);
    const stats = join(folder, "stats.json");
    writeFileSync(stats, '{"hours":[]}\n');
    const run = await sluice(["traffic-report", typed(model), "--stats", typed(stats), "--out", typed(stats), "--force"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`is the input file ${typed(stats)}`);
    expect(readFileSync(stats, "utf8")).toBe('{"hours":[]}\n');
  });

  it("should refuse report --out equal to the model or the data", async () => {
    const model = join(folder, "m.sluice");
    if (!existsSync(model)) expect((await sluice(["build", typed(data), "--out", typed(model), "--epochs", "1", "--quiet"])).code).toBe(0);
    const before = sha(model);
    for (const out of [model, data]) {
      const run = await sluice(["report", typed(model), typed(data), "--out", typed(out), "--force", "--quiet"]);
      expect(run.code).toBe(1);
      expect(run.stderr).toContain("is the input file");
    }
    expect(sha(model)).toBe(before);
  });
});

describe("writeFileAtomic", () => {
  it("should name the target, not the temporary file, when the folder is missing", () => {
    expect(() => writeFileAtomic(join(folder, "missing", "out.bin"), "x")).toThrow(`cannot write ${join(folder, "missing", "out.bin")}: the folder ${join(folder, "missing")} does not exist`);
  });

  it("should leave temporary files of running processes alone", () => {
    const mine = join(folder, `.keep.bin.${process.pid}.1.tmp`);
    writeFileSync(mine, "in progress");
    expect(removeStaleTemporaryFiles(join(folder, "keep.bin"))).toEqual([]);
    expect(existsSync(mine)).toBe(true);
  });
});
