// Budgets are visible and enforced: the minified runtime bundle (what an application or
// Worker ships) stays under its stated ceiling. Sizes are deterministic, so this may be an
// assertion; speed is never asserted here (it is measured by npm run bench).
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { bundleRuntime, RUNTIME_BUNDLE_CEILING } from "../../scripts/bundle-runtime.ts";

const runtimeDirectory = fileURLToPath(new URL("../../runtime/", import.meta.url));

describe("the runtime bundle", () => {
  it("should stay under its size ceilings when minified", async () => {
    const sizes = await bundleRuntime();
    console.log(`runtime bundle ${sizes.raw} B minified, ${sizes.gzip} B gzip (${sizes.ours} B of it ours)`);
    expect(sizes.raw).toBeLessThanOrEqual(RUNTIME_BUNDLE_CEILING.raw);
    expect(sizes.gzip).toBeLessThanOrEqual(RUNTIME_BUNDLE_CEILING.gzip);
  });

  it("should have no eval or new Function in our own runtime code, which Workers forbid", () => {
    // msgpackr's decoder has one guarded `new Function` for its "records" extension, which our
    // headers never use; it falls back to plain code when eval is refused (the Worker tests
    // run the bundle in real workerd, where eval is refused).
    for (const file of readdirSync(runtimeDirectory, { recursive: true }) as string[]) {
      if (!file.endsWith(".ts")) continue;
      const source = readFileSync(join(runtimeDirectory, file), "utf8");
      expect(/\beval\s*\(|new Function\s*\(/.test(source), file).toBe(false);
    }
  });
});
