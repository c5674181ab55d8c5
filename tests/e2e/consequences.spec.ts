import { test, expect } from "@playwright/test";
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import path from "node:path";
import { size } from "../../lib/design/sizing";
import { parseVariable } from "../../lib/design/vary";
import { profileSchema, profileSeries } from "../../lib/design/profile";
import { packSchema, productSchema } from "../../lib/thermal/definitions";
import { limitSetSchema } from "../../lib/exposure/limits";
import { GROWTH_LIMITS, GROWTH_MODEL } from "./helpers/growthInputs";

const DEMO = path.join(__dirname, "../../public/demo");

test("a product with growth and shelf-life models, a limit set with a growth rule, and a review showing the curve and the rule", async ({ page }) => {
  // the demo trace (the 16 June dock delay keeps the core above 5 °C for hours)
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await page.locator("#f-name").fill("Route 7 growth e2e");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");

  // product: the demo tray's numbers with a shelf-life model and a growth model (invented parameters)
  await page.goto("/products");
  await page.getByTestId("product-name").fill("Growth tray e2e");
  await page.getByTestId("initial_C").fill("3.2");
  await page.getByTestId("mass_kg").fill("0.45");
  await page.getByTestId("area_m2").fill("0.062");
  await page.getByTestId("h_W_m2K").fill("2.5");
  await page.getByTestId("cp_J_kgK").fill("3600");
  await page.getByTestId("add-shelf-life").click();
  await page.getByTestId("cons-0-id").fill("sl");
  await page.getByTestId("cons-0-reference_C").fill("4");
  await page.getByTestId("cons-0-shelf_life_days").fill("10");
  await page.getByTestId("cons-0-template").selectOption("fresh-seafood-sqrt");
  await expect(page.getByTestId("cons-0-tmin_C")).toHaveValue("-10");
  await expect(page.getByTestId("cons-0-template-source")).toContainText("Dalgaard (2002)");
  await page.getByTestId("add-growth").click();
  await page.getByTestId("cons-1-id").fill("lm");
  await page.getByTestId("cons-1-organism").fill("test organism (invented parameters)");
  await page.getByTestId("cons-1-b_per_C_sqrt_h").fill("5");
  await page.getByTestId("cons-1-tmin_C").fill("-1.5");
  await page.getByTestId("cons-1-lag_h").fill("10");
  await page.getByTestId("cons-1-source").fill("invented for the end-to-end test");
  await page.getByRole("button", { name: "Save product" }).click();
  // refused by field, and the form keeps what was typed
  await expect(page.getByTestId("error-cons-1-b_per_C_sqrt_h")).toHaveText("b_per_C_sqrt_h must be between 0.001 and 1 1/(°C·√h)");
  await expect(page.getByTestId("cons-1-organism")).toHaveValue("test organism (invented parameters)");
  await expect(page.getByTestId("cons-0-tmin_C")).toHaveValue("-10");
  await page.getByTestId("cons-1-b_per_C_sqrt_h").fill("0.03");
  await page.getByTestId("consequences").screenshot({ path: "test-results/consequence-editor.png" });
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("product-list")).toContainText("Growth tray e2e");

  // limit set: a time rule and a growth rule on the product's model
  await page.goto("/limits");
  await page.locator("#f-ls-name").fill("Growth plan e2e");
  await page.locator("#f-accuracy").fill("0.5");
  await page.getByLabel("rule 1 id").fill("core-above-5C");
  await page.getByLabel("rule 1 threshold").fill("5");
  await page.getByLabel("rule 1 max cumulative minutes").fill("120");
  await page.getByRole("button", { name: "Add a rule" }).click();
  await page.getByLabel("rule 2 id").fill("lm-0.1-log");
  await page.getByLabel("rule 2 kind").selectOption("growth");
  await page.getByLabel("rule 2 model").fill("lm");
  await page.getByLabel("rule 2 max log10 increase").fill("0.1");
  await page.screenshot({ path: "test-results/consequence-limits.png", fullPage: true });
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText("growth of model lm on the core, at most 0.1 log10 increase");

  // the review
  await page.goto("/reviews/new");
  await page.getByLabel("Title").fill("E2E growth route 7");
  await page.locator("#f-traceId").selectOption({ label: "Route 7 growth e2e (361 samples)" });
  await page.locator("#f-productId").selectOption({ label: "Growth tray e2e v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Growth plan e2e v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByText("Growth and shelf life on other channels (optional)").click();
  await page.getByTestId("cc-air").check();
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: E2E growth route 7" })).toBeVisible();
  const card = page.getByTestId("consequences-card");
  await expect(card).toBeVisible();
  await expect(page.getByTestId("consequence-caution")).toContainText("do not replace challenge tests");
  await expect(page.getByTestId("growth-chart")).toBeVisible();
  await expect(page.getByTestId("consequence-curve-lm-on-the-core")).toHaveAttribute("d", /^M/);
  // the comparison line: the same history's running minutes above 5 °C, on its own scale
  await expect(page.getByTestId("growth-chart").getByTestId("consequence-secondary").locator("path")).toHaveAttribute("d", /^M/);
  await expect(page.getByTestId("growth-chart")).toContainText("core: minutes above 5 °C");
  await expect(page.getByTestId("shelf-chart")).toBeVisible();
  await expect(page.getByTestId("consequence-limit")).toHaveCount(1);
  await expect(page.getByTestId("log10-lm@core")).toContainText("log10 increase");
  await expect(page.getByTestId("consumed-sl@core")).toContainText("% consumed");
  await expect(page.getByTestId("remaining-sl@core")).toContainText("days at 4 °C");
  await expect(page.getByTestId("comparison-lm@core")).toContainText(/min above 5 °C \(rule core-above-5C\)/);
  // the air for comparison, drawn dashed: the air was warmer than the core, so its growth is larger
  await expect(page.getByTestId("consequence-curve-lm-on-the-air")).toHaveAttribute("stroke-dasharray", "4 3");
  const row = page.getByTestId("consequence-rule-lm-0.1-log");
  await expect(row).toContainText(/pass|fail|inconclusive/);
  await expect(row).toContainText("log10");
  await page.screenshot({ path: "test-results/consequences.png", fullPage: true });
  await card.screenshot({ path: "test-results/consequences-card.png" });

  // the JSON export carries the consequences
  const json = await (await page.request.get(page.url() + "/export/review.json")).json();
  expect(json.result.consequences.map((c: { id: string }) => c.id)).toEqual(["sl@core", "lm@core", "sl@air", "lm@air"]);
  const byId = Object.fromEntries(json.result.consequences.map((c: { id: string }) => [c.id, c]));
  expect(byId["lm@air"].log10_increase).toBeGreaterThan(byId["lm@core"].log10_increase);
  expect(json.result.consequence_rules[0].id).toBe("lm-0.1-log");

  // the printed report carries the same part
  await page.goto(page.url() + "/report");
  await expect(page.getByTestId("consequences-card")).toBeVisible();
  await expect(page.getByTestId("growth-chart")).toBeVisible();
  await page.screenshot({ path: "test-results/consequences-report.png", fullPage: true });

  // Monte Carlo in a review: how often the growth rule fails when b is uncertain (±20 %, 50 seeded samples)
  await page.goto("/reviews/new");
  await page.getByLabel("Title").fill("E2E growth Monte Carlo");
  await page.locator("#f-traceId").selectOption({ label: "Route 7 growth e2e (361 samples)" });
  await page.locator("#f-productId").selectOption({ label: "Growth tray e2e v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Growth plan e2e v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByText("Propagate input uncertainty (optional)").click();
  await page.getByTestId("uncertainty-json").fill('{"inputs": [{"path": "product.consequences.1.b_per_C_sqrt_h", "plusminus": 20, "percent": true}], "samples": 50, "seed": 3}');
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("uncertainty-summary")).toContainText(/lm-0\.1-log: \d+(\.\d)? %/);
});

test("sizing against a growth rule: the rule governs, and its log10 increase is plotted against the wall with its limit", async ({ page }) => {
  const url = `file:${path.resolve("test-results", "e2e-db", "e2e.db")}`;
  execFileSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "tests/e2e/helpers/seedGrowthDesign.ts"], { env: { ...process.env, DATABASE_URL: url }, stdio: "inherit" });
  const S = " (growth e2e) v1";
  await page.goto("/design/size");
  await page.getByTestId("size-source").selectOption({ label: `profile: Example: summer multi-drop route, 2 days${S}` });
  await page.getByTestId("size-product").selectOption({ label: `Ready meal tray 450 g (shaped)${S}` });
  await page.getByTestId("size-pack").selectOption({ label: `EPS tote, 25 mm, with one gel pack (share per tray)${S}` });
  await page.getByTestId("size-limits").selectOption({ label: `Growth only${S}` });
  await page.getByRole("button", { name: "Use these" }).click();
  await expect(page.getByTestId("size-variable").locator("option:checked")).toHaveText("EPS wall thickness, mm");
  await expect(page.getByTestId("consequence-caution")).toContainText("must be validated for this product");
  await page.getByRole("button", { name: "Find the boundary" }).click();
  // the same search in Node on the same inputs: the browser's worker must agree to the 0.1 mm
  const demo = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));
  const expected = size({
    series: profileSeries(profileSchema.parse(demo("summer-route.profile.json"))),
    product: productSchema.parse({ ...demo("ready-meal-shaped.product.json"), consequences: [GROWTH_MODEL] }),
    pack: packSchema.parse(demo("tote.pack.json")),
    limits: limitSetSchema.parse(GROWTH_LIMITS),
    variable: parseVariable("layer:1:thickness_m")!,
    min: 0.001,
    max: 0.15,
  });
  expect(expected.feasible).toBe(true);
  await expect(page.getByTestId("size-headline")).toHaveText(`Smallest EPS wall thickness that passes every rule: ${(expected.value! * 1000).toFixed(1)} mm`);
  await expect(page.getByTestId("size-reason")).toContainText("set by rule lm-0.3");
  await expect(page.getByTestId("curve-y-label")).toHaveText("log10 increase of lm on the core, log10");
  await expect(page.getByTestId("curve-limit-line")).toContainText("lm-0.3:≤ 0.3 log10");
  await page.getByTestId("size-result").scrollIntoViewIfNeeded();
  await page.screenshot({ path: "test-results/consequence-sizing.png", fullPage: true });
});
