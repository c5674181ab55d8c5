// The database-touching integration tests again, on PostgreSQL (`npm run test:pg`; CI starts a throwaway
// server and sets CORELAG_TEST_PG_URL). Each file takes its database from tests/helpers/database.ts.
// Otherwise as vitest.config.mts.
import path from "node:path";
import { defineConfig } from "vitest/config";

export const POSTGRES_TESTS = [
  "tests/integration/auditTrail.test.ts",
  "tests/integration/auditSubjects.test.ts",
  "tests/integration/importStore.test.ts",
  "tests/integration/records.test.ts",
  "tests/integration/reviewFlow.test.ts",
  "tests/integration/demo.test.ts",
  "tests/integration/demoSizing.test.ts",
  "tests/integration/calibrationPool.test.ts",
  "tests/integration/runs.test.ts",
  "tests/integration/concurrency.test.ts",
  "tests/integration/crash.test.ts",
  "tests/integration/backup.test.ts",
  "tests/integration/jobQueue.test.ts",
  "tests/integration/diskFullPg.test.ts",
  "tests/integration/monitors.test.ts",
  "tests/integration/deviceTokenMigration.test.ts",
  "tests/integration/shipments.test.ts",
  "tests/integration/deliveryResume.test.ts",
];

export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    environment: "node",
    globalSetup: ["tests/globalSetup.ts"],
    include: POSTGRES_TESTS,
    env: { TZ: "America/Sao_Paulo", CORELAG_TEST_DB: "postgres" },
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
