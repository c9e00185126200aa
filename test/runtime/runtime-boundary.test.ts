// The architecture rule, enforced: runtime/ runs in Workers, browsers, Deno and Bun, so it
// imports no Node built-in (node:* or the bare names) and nothing from compiler/ (the
// dependency points compiler/ → runtime/ only). The core (everything but runtime/worker/)
// depends on msgpackr alone and knows nothing of the Worker; only runtime/worker/ may import
// hono or postal-mime, and it reaches the core only through the public runtime/index.ts.
// Keeping platform code in a few adapter files is common practice, no source; the rule itself
// is the project's (STYLE.md, point 1; HOUSE.md).
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

const WORKER = join(RUNTIME, "worker");
const RUNTIME_INDEX = join(RUNTIME, "index.ts");

/** The platform packages of the Worker (HTTP and e-mail parsing). */
function isWorkerPackage(specifier: string): boolean {
  return specifier === "hono" || specifier.startsWith("hono/") || specifier.startsWith("@hono/") || specifier === "postal-mime" || specifier.startsWith("postal-mime/");
}

function isWorkerEntry(file: string): boolean {
  const path = relative(RUNTIME, file).split(sep).join("/");
  return path.startsWith("worker/");
}

function isRelative(specifier: string): boolean {
  return specifier.startsWith(".") || specifier.startsWith("/");
}

/** The one third-party package the core may use (the header's MessagePack decoder). */
function isAllowedCorePackage(specifier: string): boolean {
  return specifier === "msgpackr" || specifier.startsWith("msgpackr/");
}

/** A Worker file's import that reaches the core other than through runtime/index.ts. */
function bypassesPublicSurface(file: string, specifier: string): boolean {
  if (!isRelative(specifier) || specifier.endsWith(".sluice")) return false; // bundled demo models are data, not code
  const target = resolve(dirname(file), specifier);
  return !(target === WORKER || target.startsWith(WORKER + sep)) && target !== RUNTIME_INDEX;
}

/** A core file's import that reaches into the Worker. */
function reachesWorker(file: string, specifier: string): boolean {
  if (!isRelative(specifier)) return false;
  const target = resolve(dirname(file), specifier);
  return target === WORKER || target.startsWith(WORKER + sep);
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
    expect(isWorkerPackage("hono/cors")).toBe(true);
    expect(isWorkerPackage("postal-mime")).toBe(true);
    expect(isWorkerPackage("msgpackr")).toBe(false);
    expect(isWorkerEntry(join(RUNTIME, "worker", "routes.ts"))).toBe(true);
    expect(isWorkerEntry(join(RUNTIME, "model.ts"))).toBe(false);
    expect(bypassesPublicSurface(join(WORKER, "create-app.ts"), "../model/model.ts")).toBe(true);
    expect(bypassesPublicSurface(join(WORKER, "create-app.ts"), "../index.ts")).toBe(false);
    expect(bypassesPublicSurface(join(WORKER, "create-app.ts"), "./api-error.ts")).toBe(false);
    expect(reachesWorker(join(RUNTIME, "model", "model.ts"), "../worker/app-config.ts")).toBe(true);
    expect(isAllowedCorePackage("msgpackr/unpack")).toBe(true);
    expect(isAllowedCorePackage("hono")).toBe(false);
  });

  it("imports no Node built-in module from any runtime file", () => {
    const violations = files.flatMap((file) => importsOf(file).filter(isNodeBuiltin).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("imports nothing under compiler/ from any runtime file", () => {
    const violations = files.flatMap((file) => importsOf(file).filter((specifier) => reachesCompiler(file, specifier)).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("imports hono and postal-mime only from runtime/worker/", () => {
    const violations = files
      .filter((file) => !isWorkerEntry(file))
      .flatMap((file) => importsOf(file).filter(isWorkerPackage).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("uses no third-party package in the core but msgpackr", () => {
    const violations = files
      .filter((file) => !isWorkerEntry(file))
      .flatMap((file) => importsOf(file).filter((specifier) => !isRelative(specifier) && !isAllowedCorePackage(specifier)).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("reaches the core from runtime/worker/ only through runtime/index.ts", () => {
    const workerFiles = files.filter(isWorkerEntry);
    expect(workerFiles.length).toBeGreaterThanOrEqual(10); // the scan sees the Worker's files
    const violations = workerFiles.flatMap((file) => importsOf(file).filter((specifier) => bypassesPublicSurface(file, specifier)).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });

  it("imports nothing from runtime/worker/ in the core", () => {
    const violations = files
      .filter((file) => !isWorkerEntry(file))
      .flatMap((file) => importsOf(file).filter((specifier) => reachesWorker(file, specifier)).map((specifier) => `${name(file)} imports ${specifier}`));
    expect(violations).toEqual([]);
  });
});
