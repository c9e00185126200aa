// `sluice serve <model> [--port N] [--host H]`: the Worker's HTTP API on Node, built by the
// same createApp, so a local server answers exactly like the deployed Worker. Settings come
// from the environment under the Worker's variable names (API_TOKEN, CORS_ORIGINS, ...).
// Listens on loopback unless --host says otherwise; stops on SIGINT or SIGTERM.

import { serve } from "@hono/node-server";
import type { Http2Bindings, HttpBindings } from "@hono/node-server";
import type { AddressInfo } from "node:net";
import { appConfigFromEnv } from "../../../runtime/worker/app-config.ts";
import { createApp } from "../../../runtime/worker/create-app.ts";
import { loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";

const SERVE_OPTIONS = optionsOf("serve");

/** Runs the serve command until the process is told to stop; returns the exit code. */
export async function serveCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, SERVE_OPTIONS);
  if (args.positionals.length !== 1) throw new UsageError("serve needs one model file: sluice serve <model> [--port N] [--host H]");
  const portText = valueOf(args, "--port") ?? "8787";
  const port = Number(portText);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new UsageError(`--port: expected an integer from 0 to 65535, got "${portText}"`);
  const host = valueOf(args, "--host") ?? "127.0.0.1";
  const model = loadModelFile(args.positionals[0]);
  const app = createApp(model, appConfigFromEnv(process.env));
  const server = await new Promise<ReturnType<typeof serve>>((resolve, reject) => {
    const started = serve({ fetch: closingAfterUnreadBodies(app.fetch), port, hostname: host }, () => resolve(started));
    started.once("error", (error: NodeJS.ErrnoException) => reject(new Error(`cannot listen on ${host}:${port}: ${error.code ?? error.message}`)));
  });
  const address = server.address() as AddressInfo;
  const shownHost = address.family === "IPv6" ? `[${address.address}]` : address.address;
  process.stdout.write(`sluice serve: model ${model.meta.contentId} (${model.labels.join(", ")}) on http://${shownHost}:${address.port}\n`);
  await new Promise<void>((resolve) => {
    const stop = () => {
      process.off("SIGINT", stop);
      process.off("SIGTERM", stop);
      server.close(() => resolve());
      // Idle keep-alive connections would hold close() open; requests in flight still finish.
      if ("closeIdleConnections" in server) server.closeIdleConnections();
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
  return 0;
}

type FetchHandler = (request: Request, env: HttpBindings | Http2Bindings) => Response | Promise<Response>;

/**
 * A request answered before its body was read (a 413 for its Content-Length, a 401, a 415)
 * leaves body bytes in the connection. @hono/node-server then drains them for at most 500 ms
 * or 64 MiB and otherwise destroys the socket, so a keep-alive client's next request on it
 * would fail with a reset. Such answers say "Connection: close" instead (RFC 9112 §9.6: a
 * server that does not read the whole body closes the connection), and the client reconnects.
 */
function closingAfterUnreadBodies(fetch: (request: Request, env: unknown) => Response | Promise<Response>): FetchHandler {
  return async (request, env) => {
    const response = await fetch(request, env);
    const { incoming, outgoing } = env;
    if (!incoming.readableEnded && !outgoing.headersSent) outgoing.setHeader("connection", "close");
    return response;
  };
}
