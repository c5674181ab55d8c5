import path from "node:path";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    environment: "node",
    globalSetup: ["tests/globalSetup.ts"],
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    // Integration tests migrate their own SQLite files; a non-UTC zone catches code that forgets a zone.
    env: { TZ: "America/Sao_Paulo" },
    testTimeout: 60_000,
    // Hooks migrate databases and start `next start`: as slow as a test on a busy 2-core machine.
    hookTimeout: 120_000,
  },
});
