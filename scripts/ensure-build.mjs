// Builds the app before the end-to-end tests, so they never run against a stale build.
// CI builds once just before and sets CORELAG_SKIP_BUILD=1.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

if (process.env.CORELAG_SKIP_BUILD === "1" && existsSync(".next/BUILD_ID")) process.exit(0);
const r = spawnSync(process.execPath, ["node_modules/next/dist/bin/next", "build"], {
  stdio: "inherit",
  env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
});
process.exit(r.status ?? 1);
