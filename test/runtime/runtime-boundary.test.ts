// The architecture rule, enforced: runtime/ runs in Workers, browsers, Deno and Bun, so it
// imports no Node built-in (node:* or the bare names) and nothing from compiler/ (the
// dependency points compiler/ → runtime/ only); hono is allowed only in the Worker entry
// (runtime/worker/worker.ts or runtime/worker/**). Keeping platform code in a few adapter files
// is common practice, no source; the rule itself is the project's (STYLE.md, point 1).
//
// Imports are read with TypeScript's own pre-processor (ts.preProcessFile), which sees
// static imports, `export … from`, `import type`, dynamic import() and require(), and
// ignores comments and strings, so the scan neither misses nor invents an import.

import { readdirSync, readFileSync } from "node:fs";
import { builtinModules } from "node:module";
import { dirname, join, relative, resolve, sep } from "node:path";
import { fileURLToPath } from "node:url";
import ts from "typescript";
import { describe, expect, it } from "vitest";

const REPO = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const RUNTIME = join(REPO, "runtime");
const COMPILER = join(REPO, "compiler");

function typeScriptFiles(directory: string): string[] {
  const files: string[] = [];
  for (const entry of readdirSync(directory, { withFileTypes: true })) {
    const path = join(directory, entry.name);
    if (entry.isDirectory()) files.push(...typeScriptFiles(path));
    else if (entry.isFile() && entry.name.endsWith(".ts")) files.push(path);
  }
  return files.sort();
}

/** Every module specifier a file imports (static, type-only, re-export, dynamic, require). */
function importsOf(file: string): string[] {
  const info = ts.preProcessFile(readFileSync(file, "utf8"), true, true);
  return info.importedFiles.map((reference) => reference.fileName);
}

const NODE_BUILTINS = new Set(builtinModules);

function isNodeBuiltin(specifier: string): boolean {
  return specifier.startsWith("node:") || NODE_BUILTINS.has(specifier) || NODE_BUILTINS.has(specifier.split("/")[0]);
}

function reachesCompiler(file: string, specifier: string): boolean {
  if (specifier === "sluice/compiler" || specifier.startsWith("sluice/compiler/")) return true;
  if (!specifier.startsWith(".") && !specifier.startsWith("/")) return false;
  const target = resolve(dirname(file), specifier);
  return target === COMPILER || target.startsWith(COMPILER + sep);
}

function isHono(specifier: string): boolean {
  return specifier === "hono" || specifier.startsWith("hono/") || specifier.startsWith("@hono/");
}

function isWorkerEntry(file: string): boolean {
  const path = relative(RUNTIME, file).split(sep).join("/");
  return path.startsWith("worker/");
}

const files = typeScriptFiles(RUNTIME);
const name = (file: string) => relative(REPO, file).split(sep).join("/");

describe("the runtime boundary", () => {
  it("scans the runtime's files and sees their imports", () => {
    // Guards the scanner: a scan that found no file or no import would pass vacuously.
    expect(files.length).toBeGreaterThanOrEqual(10);
    const loader = importsOf(join(RUNTIME, "format", "load-model.ts"));
    expect(loader).toContain("msgpackr/unpack");
    expect(loader).toContain("./crc32.ts");
  });

  it("recognizes the imports it must refuse", () => {
    // Guards the predicates with one example of each kind of violation.
    expect(isNodeBuiltin("node:fs")).toBe(true);
    expect(isNodeBuiltin("fs/promises")).toBe(true);
    expect(isNodeBuiltin("msgpackr/unpack")).toBe(false);
    expect(reachesCompiler(join(RUNTIME, "model.ts"), "../compiler/build.ts")).toBe(true);
    expect(reachesCompiler(join(RUNTIME, "model.ts"), "./format.ts")).toBe(false);
    expect(isHono("hono/cors")).toBe(true);
    expect(isWorkerEntry(join(RUNTIME, "worker", "routes.ts"))).toBe(true);
    expect(isWorkerEntry(join(RUNTIME, "model.ts"))).toBe(false);
  });

  it("imports no Node built-in module from any runtime file", () => {
    const violations = files.flatMap((file) => importsOf(file).filter(isNodeBuiltin).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("imports nothing under compiler/ from any runtime file", () => {
    const violations = files.flatMap((file) => importsOf(file).filter((specifier) => reachesCompiler(file, specifier)).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("imports hono only from the Worker entry", () => {
    const violations = files
      .filter((file) => !isWorkerEntry(file))
      .flatMap((file) => importsOf(file).filter(isHono).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });
});
