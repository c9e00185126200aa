// The few Workers platform shapes the Sluice Worker touches, declared here instead of
// pulling in the whole Workers type package. Names and members follow the Workers runtime
// documentation (Email Workers runtime API, Rate Limiting binding, ExecutionContext).

/** An incoming e-mail as the platform hands it to `email(message, env, ctx)`. */
export interface IncomingEmailMessage {
  /** Envelope sender (SMTP MAIL FROM). */
  readonly from: string;
  /** Envelope recipient (SMTP RCPT TO). */
  readonly to: string;
  readonly headers: Headers;
  /** The whole RFC 5322 message, as received. */
  readonly raw: ReadableStream<Uint8Array>;
  readonly rawSize: number;
  /** Refuses the message at SMTP time with this reason. Await it: Miniflare only reports it then. */
  setReject(reason: string): void | Promise<void>;
  /** Sends the message on to a verified destination address, adding `X-*` headers. */
  forward(rcptTo: string, headers?: Headers): Promise<unknown>;
}

/** The Rate Limiting binding (`[[ratelimits]]` in wrangler.toml). */
export interface RateLimitBinding {
  limit(options: { key: string }): Promise<{ success: boolean }>;
}

/** What a handler may do after its response (only passed through to hono). */
export interface WorkerExecutionContext {
  waitUntil(promise: Promise<unknown>): void;
  passThroughOnException(): void;
  /** Values set by a calling Worker (service bindings); unused here. */
  props: unknown;
}

/** The Worker's bindings: `[vars]`, secrets and the optional rate limiter. All optional. */
export interface WorkerEnv {
  API_TOKEN?: string;
  CORS_ORIGINS?: string;
  MAX_BODY_BYTES?: string;
  MAX_TEXTS?: string;
  MODERATE_FIELDS?: string;
  REVIEW_BELOW?: string;
  EMAIL_ROUTES?: string | Record<string, string>;
  EMAIL_FALLBACK?: string;
  EMAIL_MIN_SCORE?: string;
  RATE_LIMITER?: RateLimitBinding;
  [name: string]: unknown;
}
