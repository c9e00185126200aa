// Starts `sluice serve` as a child process on a free loopback port and stops it again.

import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";

const CLI = fileURLToPath(new URL("../../../bin/sluice.js", import.meta.url));

export interface ServeProcess {
  url: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/**
 * Runs `sluice serve <model> --port 0` and resolves with its URL once it listens.
 * @example const server = await startServe(modelPath); await fetch(`${server.url}/healthz`)
 */
export function startServe(modelPath: string, env: Record<string, string> = {}): Promise<ServeProcess> {
  const child = spawn(process.execPath, [CLI, "serve", modelPath, "--port", "0", "--host", "127.0.0.1"], {
    env: { ...process.env, ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill("SIGTERM");
      reject(new Error(`sluice serve did not start within 30 s:\n${output}`));
    }, 30_000);
    child.stdout?.setEncoding("utf8").on("data", (chunk: string) => {
      output += chunk;
      const url = /on (http:\/\/127\.0\.0\.1:\d+)/.exec(output)?.[1];
      if (url === undefined) return;
      clearTimeout(timer);
      resolve({
        url,
        child,
        stop: () =>
          new Promise<void>((done) => {
            if (child.exitCode !== null) return done();
            child.once("exit", () => done());
            child.kill("SIGTERM");
          }),
      });
    });
    child.stderr?.setEncoding("utf8").on("data", (chunk: string) => (output += chunk));
    child.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`sluice serve exited with ${code}:\n${output}`));
    });
  });
}
