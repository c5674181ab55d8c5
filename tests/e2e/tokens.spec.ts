import { test, expect } from "@playwright/test";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";

// The administrator's token page: a device token must name the monitor it posts to (one bound to none could
// do nothing), the form keeps what was typed after that refusal, and the list links the token to its monitor.
test("a device token made on the tokens page is bound to a chosen monitor, and the form keeps its values when none is chosen", async ({ page }) => {
  await saveLumpedProduct(page, "Tray for the token page");
  await saveTemplateLimits(page, "chilled-cold-holding-5C");
  await page.goto("/monitors");
  await page.locator("#f-name").fill("Dock 4 gateway (tokens e2e)");
  await page.locator("#f-leadMin").fill("60");
  await page.getByRole("button", { name: "Create monitor" }).click();
  await expect(page.getByTestId("monitor-created")).toBeVisible();
  await page.getByTestId("open-monitor").click();
  await expect(page).toHaveURL(/\/monitors\/\w+$/);
  const monitorId = page.url().split("/monitors/")[1]!;

  await page.goto("/tokens");
  const owner = await page.locator('select[name="email"] option').nth(1).getAttribute("value");
  await page.locator('select[name="email"]').selectOption(owner!);
  await page.locator('input[name="name"]').fill("dock 4 spare gateway");
  await page.locator('select[name="scope"]').selectOption("device");
  await page.getByRole("button", { name: "Make token" }).click();
  await expect(page.getByTestId("error-monitorId")).toHaveText("a device token posts readings to one monitor: choose the monitor it is for");
  await expect(page.locator('input[name="name"]')).toHaveValue("dock 4 spare gateway");
  await expect(page.locator('select[name="scope"]')).toHaveValue("device");

  await page.getByTestId("token-monitor").selectOption(monitorId);
  await page.getByRole("button", { name: "Make token" }).click();
  await expect(page.getByTestId("token-value")).toHaveText(/^clg_/);
  const token = (await page.getByTestId("token-value").textContent())!.trim();
  await page.screenshot({ path: "test-results/tokens-device.png", fullPage: true });
  // the form starts afresh after a token is made: a second click does not make a duplicate
  await expect(page.locator('input[name="name"]')).toHaveValue("");
  await expect(page.locator('select[name="scope"]')).toHaveValue("read");
  // the token posts readings to its monitor (and only there: tests/integration/apiV1.test.ts)
  const r = await page.request.post(`/api/v1/monitors/${monitorId}/readings`, { headers: { Authorization: `Bearer ${token}` }, data: { readings: [{ t: "2026-06-16T03:00:00Z", air_C: 3 }] } });
  expect(r.status()).toBe(200);
  await page.reload();
  await expect(page.getByTestId("tokens")).toContainText("dock 4 spare gateway");
});
