import { test, expect } from "@playwright/test";
import path from "node:path";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";
import { TEST_PASSWORD } from "./helpers/auth";

const DEMO = path.join(__dirname, "../../public/demo");

test("upload the demo trace, define a product and a limit set, run a review, see the chart and numbers", async ({ page }) => {
  // 1. Upload a logger file: stored with its SHA-256.
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await page.locator("#f-name").fill("Route 7 tote 3");
  // preview before commit: detected settings, first rows, chart
  await expect(page.getByTestId("preview-summary")).toContainText("361 samples from 2026-06-16 03:00 UTC to 2026-06-16 15:00 UTC");
  await expect(page.getByTestId("preview-summary")).toContainText("header on row 5");
  await expect(page.getByTestId("preview-parsed")).toContainText("2026-06-16 03:00:00 UTC");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");
  await expect(page.getByTestId("trace-sha256")).toHaveText(/^[0-9a-f]{64}$/);

  // 2. A refused product names the field; a valid one is saved.
  await page.goto("/products");
  await page.getByTestId("product-name").fill("Ready meal 450 g");
  await page.getByTestId("initial_C").fill("3.2");
  await page.getByTestId("mass_kg").fill("0.45");
  await page.getByTestId("area_m2").fill("0.062");
  await page.getByTestId("h_W_m2K").fill("2.5");
  await page.getByTestId("cp_J_kgK").fill("-3600");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByText("specific heat must be between 500 and 6000 J/(kg·K)").first()).toBeVisible();
  await page.getByTestId("cp_J_kgK").fill("3600");
  // live preview: tau = 0.45·3600/(2.5·0.062) s = 10452 s = 2 h 54 min
  await expect(page.getByTestId("preview-tau")).toHaveText("2 h 54 min");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("product-list")).toContainText("Ready meal 450 g");

  // 3. A limit set from a template.
  await page.goto("/limits");
  await page.getByTestId("template-select").selectOption("chilled-cold-holding-5C");
  await expect(page.getByTestId("template-source")).toContainText("§3-501.16");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText("core above 5 °C, at most 240 min in all");

  // 4. Run the review.
  await page.goto("/reviews/new");
  await page.getByLabel("Title").fill("E2E route 7");
  await page.locator("#f-productId").selectOption({ label: "Ready meal 450 g v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 5 °C / 4 h (from template) v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: E2E route 7" })).toBeVisible();
  await expect(page.getByTestId("tau")).toHaveText("2 h 54 min (10,452 s)");
  await expect(page.getByTestId("temperature-chart")).toBeVisible();
  await expect(page.getByTestId("series-core-predicted-")).toHaveAttribute("d", /^M/);
  await expect(page.getByTestId("limit-line")).toHaveCount(1);
  const cumulative = Number(await page.getByTestId("cumulative-core-above-5C").textContent());
  expect(cumulative).toBeGreaterThan(200); // the dock delay keeps the core above 5 °C for hours
  await expect(page.getByTestId("outcome-value")).toHaveText(/accept|hold for review|reject/);
  await expect(page.getByTestId("caution")).toContainText("responsible food-safety professional");
  await page.screenshot({ path: "test-results/review.png", fullPage: true });
});

test("a file that cannot be imported is refused with row and column, and nothing is stored", async ({ page, request }) => {
  await page.goto("/traces");
  const broken = Buffer.from("Time,Temp\n2026-01-01T00:00:00Z,4.1\n2026-01-01T00:01:00Z,warm\n");
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "broken.csv", mimeType: "text/csv", buffer: broken });
  await expect(page.getByTestId("form-error")).toContainText("broken.csv: row 3, column 'Temp': 'warm' is not a number");
  await expect(page.getByRole("button", { name: "Upload and import" })).toBeDisabled();
  // the server refuses it too, whatever the browser did
  const res = await request.post("/api/traces", { multipart: { file: { name: "broken.csv", mimeType: "text/csv", buffer: broken }, options: "{}" } });
  expect(res.status()).toBe(422);
  expect(await res.json()).toEqual({ error: "broken.csv: row 3, column 'Temp': 'warm' is not a number. Nothing was stored." });
  await page.goto("/traces");
  await expect(page.getByText("broken.csv")).toHaveCount(0);
});

test("an .xlsx workbook is previewed and imported like a text export", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(__dirname, "../fixtures/traces/good/20-workbook-date-cells.xlsx"));
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-03-02 06:00 UTC to 2026-03-02 06:10 UTC; workbook sheet 'Sheet1'");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("3");
});

test("an ambiguous date order is asked for, and a second channel can be taken as the product probe", async ({ page }) => {
  await page.goto("/traces");
  const csv = "Serial: QX-1\nTime;Air (°C);Product simulant (°C)\n03/04/2026 06:00;3,1;2,0\n03/04/2026 06:30;3,4;2,1\n03/04/2026 07:00;3,9;2,3\n";
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "dock.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await expect(page.getByTestId("form-error")).toContainText("could be day-first or month-first; choose the date order");
  await page.getByTestId("opt-date-order").selectOption("dmy");
  await expect(page.getByTestId("preview-summary")).toContainText("3 samples from 2026-04-03 06:00 UTC");
  await expect(page.getByTestId("preview-summary")).toContainText("product probe from 'Product simulant (°C)'");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-settings")).toContainText("product probe ‘Product simulant (°C)’");
});

test("a shaped product in a pack with coolant: the preview picks the model and the review charts surface, mean and coolant", async ({ page }) => {
  await page.goto("/packs");
  await page.getByTestId("pack-name").fill("EPS tote with gel pack");
  await page.getByLabel("Inside coefficient h (W/m²·K), optional").fill("4");
  await page.getByLabel("Wall area (m²), optional").fill("0.3");
  await page.getByRole("button", { name: "Add a layer" }).click();
  await page.getByTestId("layer-0").getByLabel("thickness m").fill("0.025");
  await page.getByTestId("layer-0").getByLabel("k W/m·K").fill("0.035");
  await page.getByRole("button", { name: "Add a coolant" }).click();
  const c = page.getByTestId("coolant-0");
  await c.getByLabel("mass kg").fill("0.5");
  await c.getByLabel("latent J/kg").fill("330000");
  await c.getByLabel("cp solid").fill("2000");
  await c.getByLabel("cp liquid").fill("3800");
  await c.getByLabel("initial °C").fill("-10");
  // wall: 1/(8·0.3) + 0.025/(0.035·0.3) = 0.4167 + 2.381 = 2.80 K/W
  await expect(page.getByTestId("pack-preview")).toContainText("R = 2.80 K/W");
  await page.getByRole("button", { name: "Save pack" }).click();
  await expect(page.getByTestId("pack-list")).toContainText("gel pack 0.5 kg");

  await page.goto("/products");
  await page.getByTestId("product-name").fill("Cheese wheel");
  await page.getByTestId("initial_C").fill("4");
  await page.getByTestId("shape-kind").selectOption("cylinder");
  await page.getByTestId("shape-radius_m").fill("0.1");
  await page.getByTestId("shape-length_m").fill("0.1");
  await page.getByTestId("h_W_m2K").fill("8");
  await page.getByTestId("source-composition").check();
  const fractions: Array<[string, string]> = [["water", "0.42"], ["protein", "0.25"], ["fat", "0.29"], ["carbohydrate", "0.01"], ["fiber", "0"], ["ash", "0.03"]];
  for (const [k, v] of fractions) {
    await page.getByTestId(`composition-${k}`).fill(v);
  }
  await expect(page.getByTestId("preview-model")).toContainText("conduction");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("product-list")).toContainText("Cheese wheel");

  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await expect(page.getByTestId("preview")).toBeVisible();
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");

  await page.goto("/limits");
  await page.getByTestId("template-select").selectOption("chilled-8C-uk");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText("core above 8 °C");

  await page.goto("/reviews/new");
  await page.getByLabel("Title").fill("Cheese in tote");
  await page.locator("#f-productId").selectOption({ label: "Cheese wheel v1" });
  await page.locator("#f-packId").selectOption({ label: "EPS tote with gel pack v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 8 °C (from template) v1" });
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("model")).toHaveText(/^r–z cylinder conduction \(\d+ nodes\)$/);
  await expect(page.getByTestId("series-surface-predicted-")).toBeVisible();
  await expect(page.getByTestId("series-mean-predicted-")).toBeVisible();
  await expect(page.getByTestId("series-coolant-inner-air")).toBeVisible();
  await page.screenshot({ path: "test-results/review-conduction.png", fullPage: true });
});

test("sign off a review, open its printable report, export the findings, and correct it", async ({ page }) => {
  // Inputs: the demo trace, a bare product and a template limit set.
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await expect(page.getByTestId("preview")).toBeVisible();
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");
  await saveLumpedProduct(page, "Sandwich tray", { initial_C: "3", mass_kg: "0.3", area_m2: "0.05", h_W_m2K: "3", cp_J_kgK: "3300" });
  await saveTemplateLimits(page, "chilled-cold-holding-5C");

  await page.goto("/reviews/new");
  await page.getByLabel("Title").fill("Sandwiches route 7");
  await page.locator("#f-productId").selectOption({ label: "Sandwich tray v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 5 °C / 4 h (from template) v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
  const suggested = (await page.getByTestId("outcome-value").textContent())!;

  // A decision that differs from the suggestion needs a comment.
  await page.getByLabel("Your password").fill(TEST_PASSWORD);
  const other = suggested === "reject" ? "hold" : "reject";
  await page.locator("#f-decision").selectOption(other);
  await page.getByRole("button", { name: "Sign off" }).click();
  await expect(page.getByTestId("error-comment")).toHaveText("a decision that differs from the suggested outcome needs a comment saying why");
  await page.getByLabel(/^Comment/).fill("Pallet probed at arrival: core 4.1 °C; decision per QA plan section 7.");
  await page.getByRole("button", { name: "Sign off" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("signed off (final)");
  await expect(page.getByTestId("decision")).toContainText("by Ilse Admin (demo)");
  await expect(page.getByRole("button", { name: "Sign off" })).toHaveCount(0);

  // Printable report.
  await page.getByTestId("report-link").click();
  await expect(page.getByTestId("report")).toContainText("Corelag review report: Sandwiches route 7");
  await expect(page.getByTestId("temperature-chart")).toBeVisible();
  await page.emulateMedia({ media: "print" });
  await page.screenshot({ path: "test-results/report-print.png", fullPage: true });
  await page.emulateMedia({ media: "screen" });
  await page.goBack();

  // Export the findings as CSV.
  const download = page.waitForEvent("download");
  await page.getByTestId("export-findings").click();
  const file = await (await download).path();
  const csv = (await import("node:fs")).readFileSync(file, "utf8");
  expect(csv).toContain("title,Sandwiches route 7");
  expect(csv).toContain("signed_by,Ilse Admin (demo)");
  expect(csv).toMatch(/^core-above-5C,core,above,5,/m);

  // A correction is a new review pointing back.
  await page.getByTestId("start-correction").click();
  await expect(page.getByTestId("correcting")).toBeVisible();
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByText("Corrects")).toBeVisible();

  // The audit log holds every step, chained.
  // (re-hashed on request only: the page shows the head cheaply)
  await page.goto("/audit?verify=1");
  await expect(page.getByTestId("chain-status")).toContainText("the chain is intact and signed");
  await page.screenshot({ path: "test-results/audit-chain.png", fullPage: true });
});

test("design studies: calibrate a probe test, then size the insulation with progress, and run Monte Carlo", async ({ page }) => {
  // a probe test and the definitions
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "probe-test.csv"));
  await expect(page.getByTestId("preview-summary")).toContainText("product probe from 'Product simulant (°C)'");
  await page.locator("#f-name").fill("Probe test");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-settings")).toContainText("product probe");
  await page.goto("/products");
  await page.getByTestId("product-name").fill("Tray for calibration");
  await page.getByTestId("initial_C").fill("3.2");
  await page.getByTestId("mass_kg").fill("0.45");
  await page.getByTestId("area_m2").fill("0.062");
  await page.getByTestId("h_W_m2K").fill("2.5");
  await page.getByTestId("cp_J_kgK").fill("3600");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("product-list")).toContainText("Tray for calibration");

  await page.goto("/design/calibrate");
  await page.getByTestId("cal-trace").selectOption({ label: "Probe test" });
  await page.locator("select[name=product]").selectOption({ label: "Tray for calibration v1" });
  await page.getByRole("button", { name: "Fit" }).click();
  // the demo simulant was generated with tau = 2.5 h (9000 s)
  await expect(page.getByTestId("cal-tau")).toContainText("2 h 30 min");
  await page.getByRole("button", { name: "Save as effective pack" }).click();
  await expect(page.getByTestId("pack-list")).toContainText("Effective pack for Tray for calibration (calibrated)");

  // a profile from an example, and a limit set
  await page.goto("/design/profiles");
  await page.getByTestId("profile-example").selectOption({ index: 1 });
  await page.getByRole("button", { name: "Save profile" }).click();
  await expect(page.getByTestId("profile-list")).toContainText("Example: summer multi-drop route");
  await page.goto("/limits");
  await page.getByTestId("template-select").selectOption("chilled-8C-uk");
  await page.getByRole("button", { name: "Save limit set" }).click();

  // a pack with an insulation layer to size
  await page.goto("/packs");
  await page.getByTestId("pack-name").fill("Foam box");
  await page.getByLabel("Wall area (m²), optional").fill("0.1");
  await page.getByRole("button", { name: "Add a layer" }).click();
  await page.getByTestId("layer-0").getByLabel("thickness m").fill("0.01");
  await page.getByTestId("layer-0").getByLabel("k W/m·K").fill("0.035");
  await page.getByRole("button", { name: "Save pack" }).click();

  await page.goto("/design/size");
  await page.getByTestId("size-source").selectOption({ label: "profile: Example: summer multi-drop route, 2 days v1" });
  await page.getByTestId("size-product").selectOption({ label: "Tray for calibration v1" });
  await page.getByTestId("size-pack").selectOption({ label: "Foam box v1" });
  await page.getByTestId("size-limits").selectOption({ label: "Chilled food, 8 °C (from template) v1" });
  await page.getByRole("button", { name: "Use these" }).click();
  await page.getByRole("button", { name: "Find the boundary" }).click();
  await expect(page.getByTestId("size-headline")).toContainText("thickness");
  await expect(page.getByTestId("curve-chart")).toBeVisible();

  await page.getByTestId("mc-samples").fill("200");
  await page.getByRole("button", { name: "Run" }).click();
  await expect(page.getByTestId("mc-result")).toContainText("200 samples (seed 1)");
  await page.screenshot({ path: "test-results/design.png", fullPage: true });
});
