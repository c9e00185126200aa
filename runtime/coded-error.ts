// One factory for the project's coded errors. Each kind of error is a code map (`as const`,
// code → what it means) plus a class made here, so callers (the CLI, the Worker) switch on
// `code` and map it to an exit status or an HTTP status, and `code` type-checks against the
// map. Subclasses add what their kind knows (a byte offset, an HTTP status, a file and line).

/** An error whose `code` is one of a code map's keys. */
export interface CodedError<Code extends string> extends Error {
  readonly code: Code;
}

/**
 * What `codedErrorClass` returns: a constructor to extend. Spelled out so
 * the emitted types name nothing of Node's Error (a browser consumer has no @types/node).
 */
export interface CodedErrorClass<Codes extends Readonly<Record<string, unknown>>> {
  new (code: keyof Codes & string, message: string): CodedError<keyof Codes & string>;
}

/**
 * A base class for errors whose `code` is a key of `codes`; `name` is set to `name`.
 * @example
 * const CODES = { "not-text": "the input is not a string" } as const;
 * class InputError extends codedErrorClass("InputError", CODES) {}
 * new InputError("not-text", "expected a string, got 42").code // "not-text"
 */
export function codedErrorClass<Codes extends Readonly<Record<string, unknown>>>(name: string, _codes: Codes): CodedErrorClass<Codes> {
  // `_codes` only types the codes (a runtime copy would cost bundle bytes: the runtime ships under a ceiling).
  return class extends Error {
    // Assigned in the constructor; `declare` emits no separate field (bundle bytes).
    declare readonly code: keyof Codes & string;

    constructor(code: keyof Codes & string, message: string) {
      super(message);
      this.name = name;
      this.code = code;
    }
  };
}
