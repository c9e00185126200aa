// The review loop's schema, as `wrangler d1 migrations apply` would apply it: the statements of
// migrations/*.sql in file-name order, comments stripped. For scripts that run the Worker in a
// local Miniflare with a fresh D1 database (the load check, the review-round demo).
import { readdirSync, readFileSync } from "node:fs";

/** The statements of the migration files, in order (comments stripped). */
export function migrationStatements(): string[] {
  const directory = new URL("../migrations/", import.meta.url);
  return readdirSync(directory)
    .filter((name) => name.endsWith(".sql"))
    .sort()
    .flatMap((name) => readFileSync(new URL(name, directory), "utf8").replace(/--[^\n]*/g, "").split(";"))
    .map((sql) => sql.trim())
    .filter((sql) => sql !== "");
}
