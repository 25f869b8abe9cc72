import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL(".", import.meta.url));

// Three projects: pure unit/reference tests (no database), API tests (supertest against the
// built app and a private Postgres), and browser tests (Chromium against the same server).
export default defineConfig({
  resolve: { alias: { "@": root } },
  test: {
    projects: [
      {
        resolve: { alias: { "@": root } },
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.ts", "tests/reference/**/*.test.ts"],
          environment: "node",
          testTimeout: 60_000,
        },
      },
      {
        resolve: { alias: { "@": root } },
        test: {
          name: "api",
          include: ["tests/api/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/support/global-setup.ts"],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias: { "@": root } },
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/support/global-setup.ts"],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
