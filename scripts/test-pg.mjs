// `npm run test:pg`: the database-touching integration tests again on PostgreSQL (vitest.pg.config.mts),
// on the server CORELAG_TEST_PG_URL names (CI starts a throwaway one, see .ci/run). Without it the step
// is skipped, saying so.
import { spawnSync } from "node:child_process";

if (!process.env.CORELAG_TEST_PG_URL) {
  console.log("test:pg: skipped, CORELAG_TEST_PG_URL is not set (a PostgreSQL server for tests, e.g. postgresql://postgres@127.0.0.1:5433/postgres; .ci/run starts one)");
  process.exit(0);
}
const r = spawnSync(process.execPath, ["node_modules/vitest/vitest.mjs", "run", "-c", "vitest.pg.config.mts", ...process.argv.slice(2)], { stdio: "inherit" });
process.exit(r.status ?? 1);
