import { defineConfig } from "@playwright/test";

const PORT = Number(process.env.E2E_PORT ?? 3210);

// End-to-end tests drive the operating system's Chromium (Debian package `chromium`) against
// `next start` on a throwaway SQLite database. No browser is downloaded.
export default defineConfig({
  testDir: "tests/e2e",
  outputDir: "test-results/e2e",
  timeout: 60_000,
  workers: 1,
  reporter: [["list"]],
  // "setup" signs in once per role (tests/e2e/auth.setup.ts); the specs run signed in as the administrator
  // unless they ask for another role with test.use({ storageState: roleState(role) }).
  projects: [
    { name: "setup", testMatch: /auth\.setup\.ts$/ },
    { name: "e2e", dependencies: ["setup"], use: { storageState: "test-results/e2e-auth/admin.json" } },
  ],
  use: {
    baseURL: `http://127.0.0.1:${PORT}`,
    // Route handlers refuse cookie-authenticated writes without this site's Origin (browsers send it; API requests here do too).
    extraHTTPHeaders: { origin: `http://127.0.0.1:${PORT}` },
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
      ],
    },
  },
  webServer: {
    command: `node node_modules/tsx/dist/cli.mjs scripts/e2e-server.ts ${PORT}`,
    url: `http://127.0.0.1:${PORT}/sign-in`,
    timeout: 120_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});
