import { test, expect } from "@playwright/test";

// Issue #9: a logger export with key;value metadata in the data's delimiter above the header. The
// preview shows the metadata lines and says that times without an offset were read as UTC; the
// stored trace keeps both.
const FILE = "Logger serial;A1234\nStart;28.03.2026 23:00\nInterval;15 min\nDate;Time;Air °F;Probe °F\n28.03.2026;23:00;41.0;39.2\n28.03.2026;23:15;42.8;40.1\n28.03.2026;23:30;44.6;41.0\n";
const UTC = "the times carry no UTC offset and no time zone was chosen, so they were read as UTC; if the logger kept local time, choose its time zone";

test("metadata lines above the header are previewed and stored; the UTC assumption is a warning", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "a1234.csv", mimeType: "text/csv", buffer: Buffer.from(FILE) });
  // before: "row 2, column 'Logger serial': 'Start' is not a number"
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-03-28T23:00:00Z to 2026-03-28T23:30:00Z");
  await expect(page.getByTestId("preview-summary")).toContainText("header on row 4");
  await expect(page.getByTestId("preview-warnings")).toContainText(UTC);
  const meta = page.getByTestId("preview-metadata");
  await expect(meta.locator("tbody tr")).toHaveCount(3);
  await expect(meta.locator("tbody tr").nth(0)).toHaveText(/1\s*Logger serial\s*A1234/);
  await expect(meta.locator("tbody tr").nth(1)).toHaveText(/2\s*Start\s*28\.03\.2026 23:00/);
  await page.screenshot({ path: "test-results/import-metadata-preview.png", fullPage: true });

  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("3");
  await expect(page.getByTestId("trace-metadata")).toContainText("A1234");
  await expect(page.getByText(UTC)).toBeVisible();
});

test("choosing the logger's zone removes the UTC warning and moves the times", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "a1234-berlin.csv", mimeType: "text/csv", buffer: Buffer.from(FILE) });
  await expect(page.getByTestId("preview-warnings")).toContainText(UTC);
  await page.locator("summary", { hasText: "Import settings" }).click();
  await page.getByTestId("opt-tz").fill("Europe/Berlin");
  await page.getByTestId("opt-tz").blur();
  // 28 March 2026 23:00 in Berlin is CET, UTC+1 (summer time starts on 29 March at 02:00)
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-03-28T22:00:00Z to 2026-03-28T22:30:00Z");
  await expect(page.getByTestId("preview-warnings")).toHaveCount(0);
});
