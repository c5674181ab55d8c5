import { test, expect } from "@playwright/test";
import path from "node:path";

const DEMO = path.join(__dirname, "../../public/demo");

test("upload the demo trace, define a product and a limit set, run a review, see the chart and numbers", async ({ page }) => {
  // 1. Upload a logger file: stored with its SHA-256.
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await page.getByLabel("Name", { exact: false }).first().fill("Route 7 tote 3");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");
  await expect(page.getByTestId("trace-sha256")).toHaveText(/^[0-9a-f]{64}$/);

  // 2. A refused product names the field; a valid one is saved.
  await page.goto("/products");
  await page.getByLabel("Name").fill("Ready meal 450 g");
  await page.getByLabel("Mass (kg)").fill("0.45");
  await page.getByLabel("Specific heat (J/kg·K)").fill("-3600");
  await page.getByLabel("Surface area (m²)").fill("0.062");
  await page.getByLabel("Surface heat-transfer coefficient h (W/m²·K)").fill("2.5");
  await page.getByLabel("Initial temperature (°C)").fill("3.2");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("error-cp_J_kgK")).toHaveText("specific heat must be greater than zero");
  await page.getByLabel("Specific heat (J/kg·K)").fill("3600");
  // live preview: tau = 0.45·3600/(2.5·0.062) s = 10452 s = 2 h 54 min
  await expect(page.getByTestId("product-preview")).toContainText("2 h 54 min");
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
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: E2E route 7" })).toBeVisible();
  await expect(page.getByTestId("tau")).toHaveText("2 h 54 min (10452 s)");
  await expect(page.getByTestId("temperature-chart")).toBeVisible();
  await expect(page.getByTestId("series-core-predicted-")).toHaveAttribute("d", /^M/);
  await expect(page.getByTestId("limit-line")).toHaveCount(1);
  const cumulative = Number(await page.getByTestId("cumulative-core-above-5C").textContent());
  expect(cumulative).toBeGreaterThan(200); // the dock delay keeps the core above 5 °C for hours
  await expect(page.getByTestId("outcome-value")).toHaveText(/accept|hold for review|reject/);
  await expect(page.getByTestId("caution")).toContainText("responsible food-safety professional");
  await page.screenshot({ path: "test-results/review.png", fullPage: true });
});

test("a file that cannot be imported is refused with row and column, and nothing is stored", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles({
    name: "broken.csv",
    mimeType: "text/csv",
    buffer: Buffer.from("Time,Temp\n2026-01-01T00:00:00Z,4.1\n2026-01-01T00:01:00Z,warm\n"),
  });
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("form-error")).toHaveText("broken.csv: row 3, column 'Temp': 'warm' is not a number. Nothing was stored.");
  await page.goto("/traces");
  await expect(page.getByText("broken.csv")).toHaveCount(0);
});
