import { test, expect, type Page } from "@playwright/test";
import { execFileSync } from "node:child_process";
import path from "node:path";
import { readFileSync } from "node:fs";
import { size } from "../../lib/design/sizing";
import { parseVariable } from "../../lib/design/vary";
import { profileSchema, profileSeries } from "../../lib/design/profile";
import { packSchema, productSchema } from "../../lib/thermal/definitions";
import { limitSetSchema } from "../../lib/exposure/limits";

const DEMO = path.join(__dirname, "../../public/demo");
const demo = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));

// The demo's design inputs, stored straight into the e2e server's database (tests/e2e/helpers/seedDesign.ts).
test.beforeAll(() => {
  const url = `file:${path.resolve("test-results", "e2e-db", "e2e.db")}`;
  execFileSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "tests/e2e/helpers/seedDesign.ts"], { env: { ...process.env, DATABASE_URL: url }, stdio: "inherit" });
});

const S = " (design e2e) v1";
async function chooseDesignInputs(page: Page, limits: string) {
  await page.goto("/design/size");
  await page.getByTestId("size-source").selectOption({ label: `profile: Example: summer multi-drop route, 2 days${S}` });
  await page.getByTestId("size-product").selectOption({ label: `Ready meal tray 450 g (shaped)${S}` });
  await page.getByTestId("size-pack").selectOption({ label: `EPS tote, 25 mm, with one gel pack (share per tray)${S}` });
  await page.getByTestId("size-limits").selectOption({ label: limits + S });
  await page.getByRole("button", { name: "Use these" }).click();
  await expect(page.getByTestId("size-variable")).toBeVisible();
  // the page is server-rendered: on a busy machine a click can land before React attaches its handlers
  await expect(page.getByTestId("design-runner")).toHaveAttribute("data-hydrated", "true");
}

test("the demo tote sizes out of the box: the value in mm on the 0.1 mm grid, the governing rule and its limit line", async ({ page }) => {
  await chooseDesignInputs(page, "Harrowgate tote design (core rules of the example plan)");
  await expect(page.getByTestId("size-variable").locator("option:checked")).toHaveText("EPS wall thickness, mm");
  await expect(page.getByTestId("size-min")).toHaveValue("1");
  await expect(page.getByTestId("size-max")).toHaveValue("150");
  await page.getByRole("button", { name: "Find the boundary" }).click();
  // the same search run here in Node on the demo files: the browser's worker must agree to the 0.1 mm
  const expected = size({
    series: profileSeries(profileSchema.parse(demo("summer-route.profile.json"))),
    product: productSchema.parse(demo("ready-meal-shaped.product.json")),
    pack: packSchema.parse(demo("tote.pack.json")),
    limits: limitSetSchema.parse(demo("tote-design.limits.json")),
    variable: parseVariable("layer:1:thickness_m")!,
    min: 0.001,
    max: 0.15,
  });
  expect(expected.feasible).toBe(true);
  await expect(page.getByTestId("size-headline")).toHaveText(`Smallest EPS wall thickness that passes every rule: ${(expected.value! * 1000).toFixed(1)} mm`);
  await expect(page.getByTestId("size-reason")).toContainText("set by rule core-above-5C");
  await expect(page.getByTestId("curve-x-label")).toHaveText("EPS wall thickness, mm");
  await expect(page.getByTestId("curve-y-label")).toHaveText("time of the core above 4.5 °C, min");
  await expect(page.getByTestId("curve-note")).toHaveText("4.5 °C is rule core-above-5C's 5 °C threshold less the 0.5 K guard band");
  await expect(page.getByTestId("curve-limit-line")).toContainText("core-above-5C:≤ 120 min in all");
  await expect(page.getByTestId("size-result")).not.toContainText("layer:1:thickness_m");
  // the green feasible range starts exactly at the boundary line, not at the curve's first passing point (7.45 mm apart)
  const chosenX = Number(await page.getByTestId("chosen-line").locator("line").getAttribute("x1"));
  expect(Number(await page.getByTestId("feasible-range").getAttribute("x"))).toBeCloseTo(chosenX, 6);
  await page.getByTestId("size-result").scrollIntoViewIfNeeded();
  await page.screenshot({ path: "test-results/sizing.png", fullPage: true });

  // Monte Carlo after sizing: the sizing result stays, and the study says which wall it ran at (the boundary found)
  const headline = `Smallest EPS wall thickness that passes every rule: ${(expected.value! * 1000).toFixed(1)} mm`;
  await expect(page.getByTestId("mc-at").locator("option:checked")).toHaveText(`EPS wall thickness ${(expected.value! * 1000).toFixed(1)} mm, the boundary found above`);
  // the pack as stored is the other choice: the demo tote's 25 mm wall (public/demo/tote.pack.json)
  await expect(page.getByTestId("mc-at").locator("option")).toHaveText([`EPS wall thickness ${(expected.value! * 1000).toFixed(1)} mm, the boundary found above`, "EPS wall thickness 25.0 mm, as the pack defines it"]);
  await page.getByTestId("mc-samples").fill("100");
  await page.getByRole("button", { name: "Run" }).click();
  await expect(page.getByTestId("mc-result")).toContainText("100 samples (seed 1)");
  await expect(page.getByTestId("mc-design-value")).toHaveText(`Run at EPS wall thickness ${(expected.value! * 1000).toFixed(1)} mm, the boundary found above.`);
  // at the boundary, a ±10 % conductivity makes the governing rule fail in a share of the samples (about half: the
  // boundary is where the nominal run just passes), and the page says to add margin
  await expect(page.getByTestId("mc-margin")).toContainText("The boundary passes only with every input at its nominal value");
  await expect(page.getByTestId("size-headline")).toHaveText(headline);
  await expect(page.getByTestId("feasible-range")).toBeVisible();
  await page.screenshot({ path: "test-results/sizing-then-monte-carlo.png", fullPage: true });
});

test("sizing against a plan with an air rule says, before and after the search, that no thickness can change it", async ({ page }) => {
  await chooseDesignInputs(page, "Harrowgate chilled ready meals (example plan)");
  await expect(page.getByTestId("rule-notes-before")).toContainText("rule air-above-8C judges the air, which no EPS wall thickness changes");
  await page.getByRole("button", { name: "Find the boundary" }).click();
  await expect(page.getByTestId("size-headline")).toHaveText("No EPS wall thickness in this range passes every rule");
  await expect(page.getByTestId("size-reason")).toContainText("At 150.0 mm, the best end of the range, rule air-above-8C fails");
  await expect(page.getByTestId("rule-notes")).toContainText("drop it from the limit set used for design");
  await page.screenshot({ path: "test-results/sizing-air-rule.png", fullPage: true });
});

test("the sizing form keeps every value after a refused range", async ({ page }) => {
  await chooseDesignInputs(page, "Harrowgate tote design (core rules of the example plan)");
  await page.getByTestId("size-variable").selectOption({ label: "gel pack mass, g" });
  await page.getByTestId("size-min").fill("100");
  await page.getByTestId("size-max").fill("-5");
  await page.getByRole("button", { name: "Find the boundary" }).click();
  await expect(page.getByTestId("size-range-error")).toHaveText("to: must be greater than from (100 g)");
  await expect(page.getByTestId("size-variable").locator("option:checked")).toHaveText("gel pack mass, g");
  await expect(page.getByTestId("size-min")).toHaveValue("100");
  await expect(page.getByTestId("size-max")).toHaveValue("-5");
  await expect(page.getByTestId("size-limits").locator("option:checked")).toHaveText(`Harrowgate tote design (core rules of the example plan)${S}`);
  await expect(page.getByTestId("size-result")).toHaveCount(0);
});

test("Monte Carlo shows a filled 5–95 % band with the nominal line and the limit lines on top", async ({ page }) => {
  await chooseDesignInputs(page, "Harrowgate tote design (core rules of the example plan)");
  // the uncertain input in words: the EPS wall's conductivity, ±10 % (normal)
  await expect(page.getByLabel("uncertain input 1").locator("option:checked")).toHaveText("EPS wall conductivity, W/(m·K)");
  await page.getByTestId("mc-samples").fill("100");
  await page.getByRole("button", { name: "Run" }).click();
  const result = page.getByTestId("mc-result");
  await expect(result).toContainText("100 samples (seed 1)");
  // no sizing yet: the study runs at the pack as stored, and says so
  await expect(page.getByTestId("mc-design-value")).toHaveText("Run at EPS wall thickness 25.0 mm, as the pack defines it.");
  const band = result.getByTestId("band-core-5-95-band");
  await expect(band).toHaveAttribute("d", /^M.*Z$/);
  expect(await band.getAttribute("fill")).not.toBe("none");
  await expect(result.getByTestId("series-core-nominal-inputs")).toHaveAttribute("d", /^M/);
  // the design limit set's two core thresholds, 5 °C and 8 °C
  await expect(result.getByTestId("limit-line")).toHaveCount(2);
  await expect(result.getByTestId("limit-line").first()).toContainText("core-above-5C");
  // drawn in this order: band, then limit lines, then the lines (later is on top in SVG)
  const order = await result.locator("svg").first().evaluate((svg) => Array.from(svg.querySelectorAll("[data-testid]")).map((e) => e.getAttribute("data-testid")));
  expect(order.indexOf("band-core-5-95-band")).toBeLessThan(order.indexOf("limit-line"));
  expect(order.indexOf("limit-line")).toBeLessThan(order.indexOf("series-core-nominal-inputs"));
  await result.screenshot({ path: "test-results/monte-carlo.png" });
  await page.screenshot({ path: "test-results/monte-carlo-page.png", fullPage: true });
});

test("the calibration form keeps every value after a refused factor, and its checkboxes sit beside their words", async ({ page }) => {
  await page.goto("/design/calibrate");
  await page.getByTestId("cal-trace").selectOption({ label: "Probe test (design e2e)" });
  await page.getByTestId("cal-product").selectOption({ label: `Ready meal tray 450 g (in tote)${S}` });
  await page.getByTestId("cal-fit-initial").check();
  await page.getByTestId("cal-factor").fill("0.5");
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByTestId("cal-error")).toHaveText("Warn when R differs by more than ×: '0.5' must be a number greater than 1 (e.g. 2)");
  await expect(page.getByTestId("cal-result")).toHaveCount(0);
  await expect(page.getByTestId("cal-trace").locator("option:checked")).toHaveText("Probe test (design e2e)");
  await expect(page.getByTestId("cal-product").locator("option:checked")).toHaveText(`Ready meal tray 450 g (in tote)${S}`);
  await expect(page.getByTestId("cal-fit-initial")).toBeChecked();
  await expect(page.getByTestId("cal-fit-offset")).not.toBeChecked();
  await expect(page.getByTestId("cal-factor")).toHaveValue("0.5");

  // the checkbox is on the same line as its words: one row, vertically centred with the label
  const box = (await page.getByTestId("cal-fit-initial").boundingBox())!;
  const label = (await page.locator("label", { hasText: "fit the initial temperature" }).boundingBox())!;
  expect(label.height).toBeLessThan(box.height * 2);
  expect(Math.abs(box.y + box.height / 2 - (label.y + label.height / 2))).toBeLessThan(3);
  expect(label.width).toBeGreaterThan(box.width + 50);

  // corrected, the fit runs with the same choices
  await page.getByTestId("cal-factor").fill("3");
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByTestId("cal-tau")).toContainText("2 h 30 min");
  await page.screenshot({ path: "test-results/calibration.png", fullPage: true });
});

// The walkthrough found the design pages showing the review's caution ("recorded air", "suggested outcome"),
// which a design has neither: each design page carries its own (model estimates for a stated ambient; verify
// with a probe test; add margin; local regulations decide).
test("every design page carries the design caution, not the review's", async ({ page }) => {
  await chooseDesignInputs(page, "Harrowgate tote design (core rules of the example plan)");
  const caution = page.getByTestId("caution");
  await expect(caution).toHaveCount(1);
  await expect(caution).toContainText("model estimates for the stated ambient profile");
  await expect(caution).toContainText("Verify a pack design with a physical test (a probe test");
  await expect(caution).toContainText("add a margin");
  await expect(caution).toContainText("Local regulations and licensed food-safety practice decide");
  await expect(caution).not.toContainText("recorded air");
  await expect(caution).not.toContainText("suggested outcome");
  await caution.screenshot({ path: "test-results/design-caution.png" });
  for (const url of ["/design", "/design/size", "/design/calibrate", "/design/profiles"]) {
    await page.goto(url);
    await expect(page.getByTestId("caution"), url).toHaveCount(1);
    await expect(page.getByTestId("caution"), url).toHaveAttribute("data-variant", "design");
    await expect(page.getByTestId("caution"), url).toContainText("probe test");
  }
});
