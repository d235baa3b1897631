import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

const here = path.dirname(fileURLToPath(import.meta.url));

// Unit tests run anywhere; integration and e2e tests expect the services that scripts/test.mjs starts.
export default defineConfig({
  resolve: { alias: { "@": here, "server-only": path.resolve(here, "tests/support/server-only.ts") } },
  test: {
    include: ["tests/**/*.test.ts"],
    environment: "node",
    testTimeout: 30_000,
    hookTimeout: 120_000,
    fileParallelism: false,
    pool: "forks",
  },
});
