// Public surface of sluice/worker: the HTTP API as a hono app over a loaded model, and the
// e-mail handler, for building your own Worker (or any Web-standard server) around a model.
// runtime/worker/worker.ts is the deployable demo Worker built from these.

export { createApp } from "./create-app.ts";
export type { SluiceApp } from "./create-app.ts";
export { appConfigFromEnv, resolveAppConfig, DEFAULT_APP_CONFIG, ConfigError } from "./app-config.ts";
export type { AppConfig, EmailConfig } from "./app-config.ts";
export { handleEmail } from "./handle-email.ts";
export type { EmailModels, EmailOutcome } from "./route-email.ts";
export type { IncomingEmailMessage, RateLimitBinding, WorkerEnv, WorkerExecutionContext } from "./platform-types.ts";
