// The part of the D1 binding (Cloudflare's SQLite database) the review loop uses, declared
// here instead of pulling in the whole Workers type package. Names follow the D1 Worker
// Binding API documentation (prepare / bind / run / first / all, batch).

export interface D1Result<Row = Record<string, unknown>> {
  results: Row[];
  success: boolean;
  meta: { changes?: number; last_row_id?: number; [key: string]: unknown };
}

export interface D1PreparedStatement {
  bind(...values: unknown[]): D1PreparedStatement;
  run<Row = Record<string, unknown>>(): Promise<D1Result<Row>>;
  first<Row = Record<string, unknown>>(): Promise<Row | null>;
  all<Row = Record<string, unknown>>(): Promise<D1Result<Row>>;
}

export interface D1Database {
  prepare(sql: string): D1PreparedStatement;
  batch<Row = Record<string, unknown>>(statements: D1PreparedStatement[]): Promise<D1Result<Row>[]>;
}

/** True when `value` looks like a D1 binding (it has prepare and batch). */
export function isD1Database(value: unknown): value is D1Database {
  return typeof value === "object" && value !== null && typeof (value as D1Database).prepare === "function" && typeof (value as D1Database).batch === "function";
}
