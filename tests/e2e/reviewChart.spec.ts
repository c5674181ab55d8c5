import { test, expect, type Page } from "@playwright/test";
import { readFileSync } from "node:fs";
import path from "node:path";
import { saveLumpedProduct } from "./helpers/seedDefinitions";

// Issue 9, "Charts that show what matters" and "Times ... people can read": the review chart shades
// each excursion, labels each limit line with its rules and channels, draws the guard band and the
// Monte Carlo band, and shows times in the display zone. Screenshots land in test-results/.
const DEMO = path.join(__dirname, "../../public/demo");
test.use({ timezoneId: "Europe/Berlin" });

async function product(page: Page, name: string) {
  await saveLumpedProduct(page, name);
}

/** The demo plan (public/demo/ready-meal.limits.json): core above 5 °C, core peak 8 °C and air above 8 °C, ±0.5 K. */
async function demoLimits(page: Page, name: string) {
  await page.goto("/limits");
  await page.locator("#f-ls-name").fill(name);
  await page.locator("#f-accuracy").fill("0.5");
  await page.getByLabel("rule 1 id").fill("core-above-5C");
  await page.getByLabel("rule 1 threshold").fill("5");
  await page.getByLabel("rule 1 max cumulative minutes").fill("120");
  await page.getByRole("button", { name: "Add a rule" }).click();
  await page.getByLabel("rule 2 id").fill("core-peak-8C");
  await page.getByLabel("rule 2 threshold").fill("8");
  await page.getByLabel("rule 2 max peak").fill("8");
  await page.getByRole("button", { name: "Add a rule" }).click();
  await page.getByLabel("rule 3 id").fill("air-above-8C");
  await page.getByLabel("rule 3 channel").selectOption("air");
  await page.getByLabel("rule 3 threshold").fill("8");
  await page.getByLabel("rule 3 max cumulative minutes").fill("180");
  await page.getByLabel("rule 3 max continuous minutes").fill("120");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText(name);
}

test("the review chart shades every excursion, names the rules on each limit line, and draws the guard band and the Monte Carlo band", async ({ page, request }) => {
  const up = await request.post("/api/traces", { multipart: { file: { name: "route7-tote3.csv", mimeType: "text/csv", buffer: readFileSync(path.join(DEMO, "route7-tote3.csv")) }, name: "Chart trace", options: "{}" } });
  expect(up.status()).toBe(201);
  const traceId = ((await up.json()) as { id: string }).id;
  await product(page, "Chart meal");
  await demoLimits(page, "Chart plan");
  await page.goto(`/reviews/new?trace=${traceId}`);
  await page.getByLabel("Title").fill("Chart review");
  await page.locator("#f-productId").selectOption({ label: "Chart meal v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chart plan v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByText("Propagate input uncertainty (optional)").click();
  await page.getByTestId("uncertainty-json").fill('{"inputs": [{"path": "product.h_W_m2K", "plusminus": 25, "percent": true, "distribution": "normal"}], "samples": 200, "seed": 1, "use_in_guard_band": true}');
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");

  const chart = page.getByTestId("temperature-chart");
  // one shaded span per excursion row in the table
  const excursionRows = await page.locator("[data-testid^='excursion-row-']").count();
  expect(excursionRows).toBeGreaterThan(0);
  await expect(chart.getByTestId("excursion-shade")).toHaveCount(excursionRows);
  // two limit lines (5 °C and 8 °C); the 8 °C line names both the core and the air rule
  await expect(chart.getByTestId("limit-line")).toHaveCount(2);
  const label8 = chart.getByTestId("limit-label").filter({ hasText: "air-above-8C" });
  await expect(label8).toContainText("core-peak-8C (core, above, guard ±");
  await expect(label8).toContainText("air-above-8C (air, above, guard ±0.5 K)");
  await expect(chart.getByTestId("limit-label").filter({ hasText: "core-above-5C" })).toContainText("core-above-5C (core, above, guard ±");
  // guard bands: the air rule's ±0.5 K (sensor) and the core rules' wider one (sensor and the Monte Carlo
  // half-width), so the 8 °C line has two nested strips and the 5 °C line one
  await expect(chart.getByTestId("guard-band")).toHaveCount(3);
  // the Monte Carlo band is a filled area, under the limit lines and the deterministic core line
  const band = chart.getByTestId("band-core-5-95-band-monte-carlo-200-samples-");
  await expect(band).toHaveAttribute("d", /^M.*Z$/);
  const order = await chart.locator("svg > *").evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
  // band first, then the limit lines, then the deterministic core line, then the rule labels: nothing hides the band's edges or the line
  expect(order.indexOf("band-core-5-95-band-monte-carlo-200-samples-")).toBeLessThan(order.indexOf("limit-line"));
  expect(order.indexOf("limit-line")).toBeLessThan(order.indexOf("series-core-predicted-"));
  expect(order.indexOf("series-core-predicted-")).toBeLessThan(order.indexOf("limit-label"));

  // times in the browser's zone (the demo file carries offsets, so the trace has no named zone of its own)
  await expect(page.getByTestId("zone-picker")).toBeVisible();
  await expect(page.locator("dd", { hasText: "route7-tote3.csv" })).toContainText("2026-06-16 05:00 – 17:00 CEST");
  await chart.locator("svg").hover({ position: { x: 200, y: 100 } });
  await expect(chart.getByTestId("chart-time")).toHaveText(/^2026-06-16 0\d:\d\d:\d\d CEST$/);
  await page.mouse.move(0, 0);
  await page.screenshot({ path: "test-results/review-chart.png", fullPage: true });
  await chart.screenshot({ path: "test-results/review-chart-only.png" });

  // a chosen zone wins, for every page
  await page.getByTestId("zone-picker").selectOption("UTC");
  await expect(page.locator("dd", { hasText: "route7-tote3.csv" })).toContainText("2026-06-16 03:00 – 15:00 UTC");
  await page.goto(`/traces/${traceId}`);
  await expect(page.getByTestId("trace-span")).toHaveText("2026-06-16 03:00 – 15:00 UTC");
  await page.getByTestId("zone-picker").selectOption("");
});

test("a 30-day, 1-minute review sends the browser a decimated chart, and a one-minute spike is still drawn", async ({ page, request }) => {
  const start = Date.parse("2026-05-01T00:00:00Z");
  const rows = ["time,air (°C)"];
  for (let i = 0; i < 30 * 24 * 60; i++) {
    const v = i === 20_000 ? 15.5 : 4 + 1.5 * Math.sin((2 * Math.PI * i) / 1440);
    rows.push(`${new Date(start + i * 60_000).toISOString()},${v.toFixed(2)}`);
  }
  const up = await request.post("/api/traces", { multipart: { file: { name: "thirty-days.csv", mimeType: "text/csv", buffer: Buffer.from(rows.join("\n")) }, name: "Thirty days", options: "{}" } });
  expect(up.status()).toBe(201);
  const traceId = ((await up.json()) as { id: string }).id;
  await product(page, "Long meal");
  await page.goto("/limits");
  await page.locator("#f-ls-name").fill("Long plan");
  await page.getByLabel("rule 1 id").fill("air-above-8C");
  await page.getByLabel("rule 1 channel").selectOption("air");
  await page.getByLabel("rule 1 threshold").fill("8");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText("Long plan");
  await page.goto(`/reviews/new?trace=${traceId}`);
  await page.getByLabel("Title").fill("Thirty days");
  await page.locator("#f-productId").selectOption({ label: "Long meal v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Long plan v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
  // the one-minute spike to 15.5 °C is one excursion, shaded and drawn
  await expect(page.getByTestId("excursion-shade")).toHaveCount(1);
  const id = page.url().split("/").pop()!;

  // The whole HTML document (server-drawn SVG + the series the chart hydrates from) for 43,200 samples.
  const html = await (await request.get(`/reviews/${id}`)).text();
  console.log(`review page for 43,200 samples: ${html.length} characters of HTML`);
  expect(html.length).toBeLessThan(400_000);
  // the series the browser receives: the drawn core path has a vertex per kept sample, not per sample
  const d = (await page.getByTestId("series-core-predicted-").getAttribute("d"))!;
  expect(d.split("L").length).toBeLessThan(2_500);
  const air = (await page.getByTestId("series-air-logger-").getAttribute("d"))!;
  // the spike's vertex is in the drawn air line: the line rises above the 8 °C limit line (the rest stays below 5.5 °C)
  const ys = air.split(/[ML]/).filter(Boolean).map((p) => Number(p.split(",")[1]));
  const y8 = Number(await page.getByTestId("limit-line").locator("line").getAttribute("y1"));
  expect(Math.min(...ys)).toBeLessThan(y8 - 20);
  // the full series stays in the CSV export
  const csv = await (await request.get(`/reviews/${id}/export/series.csv`)).text();
  expect(csv.trim().split("\n").length).toBe(1 + 43_200);
});

test("every page has a favicon: no request of a page answers 404", async ({ page, request }) => {
  const missing: string[] = [];
  page.on("response", (r) => {
    if (r.status() === 404) missing.push(r.url());
  });
  for (const path of ["/", "/traces", "/products", "/audit"]) await page.goto(path);
  const icon = await request.get("/favicon.ico");
  expect(icon.status()).toBe(200);
  expect(icon.headers()["content-type"]).toMatch(/image/);
  expect(missing).toEqual([]);
});
