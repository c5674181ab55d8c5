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
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-03-28 23:00 UTC to 2026-03-28 23:30 UTC");
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
  // 28 March 2026 23:00 in Berlin is CET, UTC+1 (summer time starts on 29 March at 02:00); the preview
  // shows times in the chosen zone, named, and the stored instants are an hour earlier in UTC
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-03-28 23:00 CET to 2026-03-28 23:30 CET");
  await expect(page.getByTestId("preview-warnings")).toHaveCount(0);
  await page.getByRole("button", { name: "Upload and import" }).click();
  // the trace page shows its times in its import zone; in UTC they are an hour earlier
  await expect(page.getByTestId("trace-span")).toHaveText("2026-03-28 23:00 – 23:30 CET");
  await page.getByTestId("zone-picker").selectOption("UTC");
  await expect(page.getByTestId("trace-span")).toHaveText("2026-03-28 22:00 – 22:30 UTC");
  await page.getByTestId("zone-picker").selectOption("");
});

test("Shift-JIS text is refused with the reason, and the encoding can be chosen instead", async ({ page }) => {
  await page.goto("/traces");
  // 日時,温度 in Shift-JIS (93 FA 8E 9E 2C 89 B7 93 78), then two rows
  const sjis = Buffer.concat([Buffer.from([0x93, 0xfa, 0x8e, 0x9e, 0x2c, 0x89, 0xb7, 0x93, 0x78, 0x0a]), Buffer.from("2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n")]);
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "sjis.csv", mimeType: "text/csv", buffer: sjis });
  await expect(page.getByTestId("form-error")).toContainText("sjis.csv: the file is neither UTF-8 nor Windows-1252 text");
  await expect(page.getByRole("button", { name: "Upload and import" })).toBeDisabled();
  // the user says what it is: read as Windows-1252 on purpose
  await page.getByTestId("opt-encoding").selectOption("windows-1252");
  await expect(page.getByTestId("preview-summary")).toContainText("2 samples from 2026-03-02 06:00 UTC to 2026-03-02 06:05 UTC; windows-1252");
});
