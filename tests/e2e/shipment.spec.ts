import { test, expect } from "@playwright/test";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { saveLumpedProduct } from "./helpers/seedDefinitions";
import { loggerCsv } from "../fixtures/shipment";
import { TEST_PASSWORD } from "./helpers/auth";

// Issue 15 end to end: create a shipment with four loggers, drop four files at once, confirm the proposed
// matching (two by serial, two by file name) with the accuracy of the new serials, run the shipment review,
// see the load chart and the product × rule matrix, sign the whole load off, print it; then a design
// profile from the lane's history. Data: the invented load of tests/fixtures/shipment.ts (air 3 °C with
// known excursions: logger 3 at 12 °C for 240 min, so an air rule with no allowance above 8 °C rejects).

test("a shipment: create, drop 4 files, confirm matching, run, matrix, sign off, print, lane profile", async ({ page }) => {
  test.setTimeout(180_000);
  const dir = mkdtempSync(path.join(os.tmpdir(), "corelag-e2e-ship-"));
  const files = {
    "a.csv": loggerCsv(1), // serial SN-1001
    "b.csv": loggerCsv(2), // serial SN-1002
    "truck-middle-top.csv": loggerCsv(3), // serial SN-1003, named by no entry: matched by file name
    "rear-top.csv": loggerCsv(5), // serial SN-1005: matched by file name
  };
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), text);

  await saveLumpedProduct(page, "Ship tray", { initial_C: "3" });
  await page.goto("/limits");
  await page.locator("#f-ls-name").fill("Ship limits");
  await page.getByLabel("rule 1 id").fill("air-above-8C");
  await page.getByLabel("rule 1 channel").selectOption("air");
  await page.getByLabel("rule 1 threshold").fill("8");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText("Ship limits");

  await page.goto("/shipments/new");
  await page.getByLabel("Reference").fill("E2E-0616");
  await page.locator("#f-limitsId").selectOption({ label: "Ship limits v1" });
  await page.locator("#f-laneId").selectOption("");
  await page.getByLabel("New lane: name").fill("North depot → City store");
  await page.getByLabel("Origin").fill("North depot");
  await page.getByLabel("Destination").fill("City store");
  await page.getByLabel("Carrier").fill("Example Haulage");
  await page.getByLabel("Actual departure (UTC)").fill("2026-06-16T04:00");
  const rows = [
    { position: "front top", serial: "SN-1001" },
    { position: "front bottom", serial: "SN-1002" },
    { position: "middle top", pattern: "*middle-top*.csv" },
    { position: "rear top", pattern: "rear-*.csv" },
  ];
  for (let i = 1; i < rows.length; i++) await page.getByTestId("add-logger").click();
  for (const [i, r] of rows.entries()) {
    const row = page.getByTestId("logger-row").nth(i);
    await page.getByTestId(`position-${i}`).fill(r.position);
    if (r.serial) await page.getByTestId(`serial-${i}`).fill(r.serial);
    if (r.pattern) await row.getByPlaceholder("*tote3*.csv").fill(r.pattern);
    await page.getByTestId(`product-${i}-0`).selectOption({ label: "Ship tray v1" });
  }
  await page.getByTestId("create-shipment").click();
  await expect(page.getByRole("heading", { name: "Shipment E2E-0616" })).toBeVisible();
  await expect(page.getByTestId("logger-entry")).toHaveCount(4);

  // drop four files at once
  await page.getByTestId("batch-files").setInputFiles(Object.keys(files).map((f) => path.join(dir, f)));
  const preview = page.getByTestId("batch-preview");
  await expect(preview.getByTestId("batch-row")).toHaveCount(4);
  const matchOf = (file: string) => page.locator(`[data-testid=batch-row][data-file="${file}"] [data-testid=match-select]`);
  await expect(matchOf("a.csv").locator("option:checked")).toHaveText("1. front top (SN-1001)");
  await expect(matchOf("b.csv").locator("option:checked")).toHaveText("2. front bottom (SN-1002)");
  await expect(matchOf("truck-middle-top.csv").locator("option:checked")).toHaveText("3. middle top");
  await expect(matchOf("rear-top.csv").locator("option:checked")).toHaveText("4. rear top");
  await expect(page.locator(`[data-testid=batch-row][data-file="a.csv"]`)).toContainText("361");
  await expect(page.locator(`[data-testid=batch-row][data-file="a.csv"]`)).toContainText("Air (°C): air");
  for (const s of ["SN-1001", "SN-1002", "SN-1003", "SN-1005"]) await page.getByTestId(`accuracy-${s}`).fill("0.2");
  await page.screenshot({ path: "test-results/shipment-batch-preview.png", fullPage: true });
  await page.getByTestId("confirm-batch").click();
  await expect(page.getByTestId("batch-result")).toContainText("Stored 4 file(s); registered SN-1001, SN-1002, SN-1003, SN-1005");

  // run the shipment review (4 logger × product reviews in the background)
  await page.getByTestId("run-shipment").click();
  await expect(page.getByTestId("shipment-outcome")).toBeVisible({ timeout: 60_000 });
  await expect(page.getByTestId("shipment-outcome")).toContainText("reject");
  // logger 3 (12 °C for 240 min) has the most minutes above 8 °C among the rejecting loggers
  await expect(page.getByTestId("governing-logger")).toHaveText("3. middle top");
  const matrix = page.getByTestId("rule-matrix");
  await expect(matrix.locator("tbody tr")).toHaveCount(4);
  await expect(matrix.locator("tbody tr").nth(0)).toContainText("pass");
  await expect(matrix.locator("tbody tr").nth(2)).toContainText("fail");
  // each rule column says what the rule allows, each cell the minutes beyond its threshold: logger 3's air is
  // above 8 °C from 179.1 to 418.9 min (the 3 → 12 °C steps cross 8 °C 5/9 and 4/9 into their 2-min
  // intervals), 239.8 min; logger 5 (8.3 °C) from 199.9 to 348.1 min, 148.2 min (tests/fixtures/shipment.ts)
  await expect(page.getByTestId("rule-head-air-above-8C")).toHaveText("air-above-8Cair above 8 °C, no time allowed");
  await expect(matrix).toContainText("239.8 min beyond");
  await expect(matrix).toContainText("148.2 min beyond");
  await expect(page.getByTestId("load-chart")).toBeVisible();
  await expect(page.getByTestId("worst-excursions")).toContainText("3. middle top");
  await page.waitForTimeout(300);
  await page.screenshot({ path: "test-results/shipment-page.png", fullPage: true });
  await page.getByTestId("toggle-l1").uncheck();
  await page.getByTestId("mode-multiples").check();
  await expect(page.getByTestId("small-multiple")).toHaveCount(3);
  await page.getByTestId("load-chart").screenshot({ path: "test-results/shipment-small-multiples.png" });

  // one sign-off for the load
  await expect(page.getByTestId("signing-as")).toContainText("Ilse Admin (demo)");
  await page.locator("#s-decision").selectOption("accept");
  await page.locator("#s-password").fill("not-the-password");
  await page.getByTestId("sign-shipment").click();
  // a decision other than the suggestion without a comment is refused before the password is checked
  await expect(page.getByTestId("error-comment")).toContainText("needs a comment");
  await expect(page.getByTestId("error-password")).toHaveCount(0);
  await expect(page.locator("#s-decision")).toHaveValue("accept");
  await page.locator("#s-decision").selectOption("reject");
  await page.locator("#s-password").fill("not-the-password");
  await page.getByTestId("sign-shipment").click();
  await expect(page.getByTestId("error-password")).toHaveText(/^the password is wrong; nothing was signed \(\d more wrong passwords? locks? the account for 15 minutes\)$/);
  await page.locator("#s-password").fill(TEST_PASSWORD);
  await page.getByTestId("sign-shipment").click();
  await expect(page.getByTestId("shipment-status")).toContainText("signed off by Ilse Admin (demo)");
  await expect(page.getByTestId("shipment-status")).toContainText("decision reject");
  await expect(page.getByTestId("run-shipment")).toHaveCount(0);
  // every review in it is signed
  const reviewLink = matrix.getByRole("link", { name: "view the review" }).first();
  await reviewLink.click();
  await expect(page.getByTestId("review-status")).toHaveText("signed off (final)");
  await page.goBack();

  // print the whole shipment
  await page.getByTestId("shipment-report-link").click();
  await expect(page.getByTestId("shipment-report")).toBeVisible();
  await expect(page.getByTestId("report-review")).toHaveCount(4);
  await page.emulateMedia({ media: "print" });
  await page.screenshot({ path: "test-results/shipment-report.png", fullPage: true });
  await page.emulateMedia({ media: "screen" });

  // the lane: shipments over time, excursion statistics, a design profile from its history
  await page.goto("/lanes");
  await page.getByRole("link", { name: "North depot → City store" }).click();
  await expect(page.getByTestId("lane-shipments")).toContainText("E2E-0616");
  await expect(page.getByTestId("lane-stats")).toContainText("middle top");
  await expect(page.getByTestId("history-caution")).toContainText("not the temperature history of any real shipment");
  await page.getByLabel("Percentile per step").fill("95");
  await page.getByLabel("Step, min").fill("10");
  await page.getByTestId("show-profile").click();
  await expect(page.getByTestId("envelope-chart")).toBeVisible();
  await page.screenshot({ path: "test-results/lane-profile.png", fullPage: true });
  await page.getByTestId("save-profile").click();
  await expect(page.getByTestId("saved-note")).toBeVisible();
  await expect(page.getByTestId("profile-list")).toContainText("North depot → City store: P95 of 4 traces");

  await page.goto("/loggers");
  await expect(page.getByTestId("logger-register")).toContainText("SN-1005");
  await page.screenshot({ path: "test-results/logger-register.png", fullPage: true });
});

test("a single upload whose metadata names an unregistered logger offers to register it, with the accuracy asked once", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(__dirname, "../../public/demo/route7-tote3.csv"));
  await expect(page.getByTestId("preview")).toBeVisible();
  await page.locator("#f-name").fill("Register check");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-logger")).toContainText("HX-20417 · not in the logger register yet");
  const traceUrl = page.url();
  await page.getByTestId("register-serial").click();
  await expect(page.locator("#f-serial")).toHaveValue("HX-20417");
  await page.locator("#f-accuracyK").fill("0.3");
  await page.locator("#f-nextCalibrationAt").fill("2026-06-01T00:00");
  await page.getByRole("button", { name: "Register" }).click();
  await expect(page.getByTestId("logger-register")).toContainText("HX-20417");
  await expect(page.getByTestId("logger-register")).toContainText("overdue");
  // back on the trace's page (by its address: how many history entries the register form adds is the router's business)
  await page.goto(traceUrl);
  await expect(page.getByTestId("trace-logger")).toContainText("HX-20417 (in the logger register)");
});
