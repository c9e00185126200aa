// Installs a packed sluice tarball into an empty folder without the network: the consumer
// gets a lock file whose dependency entries (resolved URL + integrity) are copied from the
// repository's own lock, so `npm ci --offline` takes every tarball from npm's cache, which
// the repository's `npm ci` filled. (`npm install <tgz> --offline` would need the registry's
// package documents, which `npm ci` never caches.)

import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";

interface LockEntry {
  dev?: boolean;
  link?: boolean;
  [field: string]: unknown;
}

/** Runs a command, throwing with its output when it fails; returns stdout. */
export function run(command: string, args: string[], cwd: string): string {
  const result = spawnSync(command, args, { cwd, encoding: "utf8", maxBuffer: 64 * 1024 * 1024, env: { ...process.env, npm_config_update_notifier: "false" } });
  if (result.status !== 0) throw new Error(`${command} ${args.join(" ")} exited with ${result.status ?? result.signal}:\n${result.stdout}\n${result.stderr}`);
  return result.stdout;
}

/**
 * Writes package.json and package-lock.json for a consumer of `tarball` (a file inside
 * `folder`) and runs `npm ci --offline` there.
 * @example installOffline("/tmp/consumer", "sluice-0.1.0.tgz", "/work/repo")
 */
export function installOffline(folder: string, tarball: string, repository: string): void {
  const manifest = JSON.parse(run("tar", ["-xOzf", tarball, "package/package.json"], folder)) as Record<string, unknown>;
  const integrity = `sha512-${createHash("sha512").update(readFileSync(join(folder, tarball))).digest("base64")}`;
  const repositoryLock = JSON.parse(readFileSync(join(repository, "package-lock.json"), "utf8")) as { packages: Record<string, LockEntry> };
  const dependency = `file:${tarball}`;
  const packages: Record<string, unknown> = {
    "": { name: "consumer", dependencies: { sluice: dependency } },
    "node_modules/sluice": {
      version: manifest.version,
      resolved: dependency,
      integrity,
      license: manifest.license,
      dependencies: manifest.dependencies,
      bin: manifest.bin,
      engines: manifest.engines,
    },
  };
  // The run-time dependencies of the package are exactly the lock's non-dev entries.
  for (const [path, entry] of Object.entries(repositoryLock.packages)) {
    if (path !== "" && !entry.dev && !entry.link) packages[path] = entry;
  }
  writeFileSync(join(folder, "package.json"), JSON.stringify({ name: "consumer", private: true, type: "module", dependencies: { sluice: dependency } }, null, 2));
  writeFileSync(join(folder, "package-lock.json"), JSON.stringify({ name: "consumer", lockfileVersion: 3, requires: true, packages }, null, 2));
  run("npm", ["ci", "--offline", "--no-audit", "--no-fund", "--loglevel=error"], folder);
}
