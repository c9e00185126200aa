import { defineConfig } from "vitest/config";

// One place for the suite's shape: tests live under test/, mirroring the code.
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    testTimeout: 120_000,
    hookTimeout: 180_000,
    // Two cores: keep two forks so heavy training tests don't starve each other.
    pool: "forks",
    maxWorkers: 2,
  },
});
