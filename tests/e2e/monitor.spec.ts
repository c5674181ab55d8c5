import { test, expect } from "@playwright/test";
import { spawn } from "node:child_process";
import path from "node:path";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";

const ROOT = path.join(__dirname, "../..");
const TRACE = path.join(ROOT, "public/demo/route7-tote3.csv");

test("create a monitor, replay the demo trace with the simulator, watch the chart grow, the forecast and the alerts", async ({ page, baseURL, playwright }) => {
  test.setTimeout(180_000);
  await saveLumpedProduct(page, "Tray for the live monitor");
  await saveTemplateLimits(page, "chilled-cold-holding-5C");

  // 1. Create: a refused lead keeps what was typed; then the token is shown once.
  await page.goto("/monitors");
  await page.locator("#f-name").fill("Route 7 tote 3 live");
  await page.locator("#f-serial").fill("HX-20417");
  await page.locator("#f-leadMin").fill("-5");
  await page.getByRole("button", { name: "Create monitor" }).click();
  await expect(page.getByTestId("error-leadMin")).toContainText("0 min or more");
  await expect(page.locator("#f-name")).toHaveValue("Route 7 tote 3 live");
  await page.locator("#f-leadMin").fill("60");
  await page.getByRole("button", { name: "Create monitor" }).click();
  await expect(page.getByTestId("monitor-created")).toBeVisible();
  const token = (await page.getByTestId("device-token").textContent())!.trim();
  // an API token with the device scope, bound to this monitor (shown once)
  expect(token).toMatch(/^clg_[\w-]{43}$/);
  await page.screenshot({ path: "test-results/monitor-created.png", fullPage: true });
  await page.getByTestId("open-monitor").click();
  await expect(page.getByTestId("no-readings")).toBeVisible();
  const id = page.url().split("/monitors/")[1]!;

  // The readings endpoint answers problem+json: no token (a client without the page's session), a bad reading
  // (nothing stored, refused by index).
  const anonymous = await playwright.request.newContext({ baseURL, storageState: { cookies: [], origins: [] } });
  const noToken = await anonymous.post(`/api/v1/monitors/${id}/readings`, { data: { readings: [{ t: "2026-06-16T03:00:00Z", air_C: 3 }] } });
  expect(noToken.status()).toBe(401);
  expect(noToken.headers()["content-type"]).toContain("application/problem+json");
  await anonymous.dispose();
  const bad = await page.request.post(`/api/v1/monitors/${id}/readings`, { headers: { Authorization: `Bearer ${token}` }, data: { readings: [{ t: "2026-06-16T03:00:00Z", air_C: 3 }, { t: "2026-06-16T03:02:00", air_C: 3 }] } });
  expect(bad.status()).toBe(422);
  expect(await bad.json()).toMatchObject({ type: "/api/v1/problems/invalid-readings", refused: [{ index: 1 }] });
  expect((await (await page.request.get(`/api/v1/monitors/${id}`)).json()).last_reading).toBeNull();

  // 2. Replay the demo trace at 2000× (12 h in about 22 s) while the page is open: it grows by Server-Sent Events.
  const sim = spawn(process.execPath, [path.join(ROOT, "scripts/corelag.mjs"), "simulate", "--monitor", id, "--trace", TRACE, "--speed", "2000", "--url", baseURL!, "--token", token, "--quiet"], { cwd: ROOT, stdio: ["ignore", "pipe", "pipe"] });
  let out = "", err = "";
  sim.stdout.on("data", (d) => (out += d));
  sim.stderr.on("data", (d) => (err += d));
  const done = new Promise<number>((resolve) => sim.on("exit", (code) => resolve(code ?? -1)));

  await expect(page.getByTestId("reading-count")).toBeVisible({ timeout: 20_000 });
  const early = Number(await page.getByTestId("reading-count").textContent());
  await expect.poll(async () => Number(await page.getByTestId("reading-count").textContent()), { timeout: 30_000 }).toBeGreaterThan(early + 50);
  // the dock delay (from about 08:00 UTC in the file): the forecast reaches 5 °C within the 60 min lead
  await expect(page.getByTestId("alert-forecast").first()).toBeVisible({ timeout: 40_000 });
  await page.screenshot({ path: "test-results/monitor-live-midway.png", fullPage: true });

  expect(await done, `simulator: ${err}`).toBe(0);
  const summary = JSON.parse(out) as { sent: number; accepted: number };
  expect(summary).toMatchObject({ sent: 361, accepted: 361 });
  await expect(page.getByTestId("reading-count")).toHaveText("361", { timeout: 10_000 });
  // 307.5 min above 5 °C, as the demo review of this file finds (lumped, exact); the template's 240 min allowance with its
  // 0.5 K guard band: over it at 4.5 °C, under it at 5.5 °C, so inconclusive so far, and no rule-fail alert
  await expect(page.getByTestId("rules-running")).toContainText("core-above-5Ccoreinconclusive307.5 min0.0 min");
  await expect(page.getByTestId("alert-rule-fail")).toHaveCount(0);
  await expect(page.getByTestId("rules-verdict")).toHaveText("No rule has failed so far; core-above-5C is inconclusive (within the guard band).");
  await expect(page.getByTestId("caution")).toContainText("local regulations");
  await page.screenshot({ path: "test-results/monitor-live-end.png", fullPage: true });

  // 3. The API gives the state fields.
  const state = await (await page.request.get(`/api/v1/monitors/${id}`)).json();
  expect(Object.keys(state).sort()).toEqual(["core_C", "forecast", "id", "last_reading", "rules", "stale"]);
  // the replay delivered every 0.06 s, but the readings are 2 min apart: silence is judged against those 2 min
  // (3 × 120 s, lib/live/stale.ts), so the monitor is not stale the moment the replay ends
  expect(state.stale).toBe(false);
  await expect(page.getByTestId("stale-warning")).toHaveCount(0);
  expect(state.last_reading).toEqual({ t: "2026-06-16T15:00:00.000Z", air_C: 3 });

  // 3b. At 2000× a door opening's forecast alert is open for a fraction of a second, between two polls of the
  // navigation badge (every 5 s). One more reading, air at 20 °C: the lumped core (about 3.5 °C, tau about 3 h)
  // crosses 5 °C in about tau·ln((3.5 − 20)/(5 − 20)) ≈ 0.1·tau ≈ 17 min, inside the 60 min lead, and the alert
  // stays open, so the badge shows it at its next poll.
  const warm = await page.request.post(`/api/v1/monitors/${id}/readings`, { headers: { Authorization: `Bearer ${token}` }, data: { readings: [{ t: "2026-06-16T15:02:00Z", air_C: 20 }] } });
  expect(warm.status()).toBe(200);
  await expect(page.getByTestId("alert-badge")).toBeVisible({ timeout: 15_000 });

  // 4. Close: the readings become a trace and a review.
  await page.getByTestId("close-monitor").click();
  await expect(page).toHaveURL(/\/reviews\//);
  await page.screenshot({ path: "test-results/monitor-closed-review.png", fullPage: true });
});
