import { test, expect, type Page } from "@playwright/test";
import { readFileSync } from "node:fs";
import path from "node:path";
import { TEST_EMAIL } from "./helpers/auth";

// Findings of a user walkthrough in Chromium, each checked as a user meets it: the review page and report
// hydrate without errors (a guard band's SVG title had several text children, which React renders empty on
// the server: error #418); the rules table shows each rule's allowance; a new review starts from the
// combination last used and keeps what was typed after an error; the audit page names accounts and keeps
// its hash column inside the card. Inputs: the demo's files (public/demo), renamed so this spec finds its own.
const DEMO = path.join(__dirname, "../../public/demo");
const demoJson = (file: string, name: string) => ({ ...JSON.parse(readFileSync(path.join(DEMO, file), "utf8")), name });

test.describe.configure({ mode: "serial" });

const ids = { trace: "", product: "", pack: "", limits: "", review: "" };

/** Console errors and uncaught page errors while the page is open. */
function collectErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  page.on("pageerror", (e) => errors.push(e.message));
  return errors;
}

test("set up: the demo trace, product, pack and limit set (with its 0.5 K sensor accuracy), and a review of them", async ({ page }) => {
  const res = await page.request.post("/api/traces", {
    multipart: { file: { name: "route7-tote3.csv", mimeType: "text/csv", buffer: readFileSync(path.join(DEMO, "route7-tote3.csv")) }, name: "Walkthrough route 7", options: "{}" },
  });
  expect(res.status()).toBe(201);
  ids.trace = ((await res.json()) as { id: string }).id;
  for (const [kind, file, name] of [["product", "ready-meal.product.json", "Walkthrough tray"], ["pack", "tote.pack.json", "Walkthrough tote"], ["limits", "ready-meal.limits.json", "Walkthrough plan"]] as const) {
    const r = await page.request.post(`/api/v1/definitions/${kind}`, { data: demoJson(file, name) });
    expect(r.status(), await r.text()).toBe(201);
    ids[kind] = ((await r.json()) as { id: string }).id;
  }
  await page.goto(`/reviews/new?trace=${ids.trace}`);
  await page.getByLabel("Title").fill("Walkthrough review");
  await page.locator("#f-productId").selectOption(ids.product);
  await page.locator("#f-packId").selectOption(ids.pack);
  await page.locator("#f-limitsId").selectOption(ids.limits);
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: Walkthrough review" })).toBeVisible({ timeout: 30_000 });
  ids.review = page.url().split("/reviews/")[1]!.split(/[?#]/)[0]!;
});

test("the review page and the printed report log no console errors (no hydration mismatch)", async ({ page }) => {
  const errors = collectErrors(page);
  for (const url of [`/reviews/${ids.review}`, `/reviews/${ids.review}/report`]) {
    await page.goto(url);
    await page.waitForLoadState("networkidle");
    // the guard band of the 0.5 K sensor accuracy is drawn, with its title as one text
    await expect(page.getByTestId("guard-band").first().locator("title")).toHaveText(/^guard band \d+ °C ± 0\.5 K$/);
    await expect(page.getByTestId("rules-table")).toBeVisible();
  }
  expect(errors).toEqual([]);
});

test("the review's rules table gives each rule's allowance beside its time beyond the threshold", async ({ page }) => {
  await page.goto(`/reviews/${ids.review}`);
  // public/demo/ready-meal.limits.json
  await expect(page.getByTestId("allowance-core-above-5C")).toHaveText("at most 120 min in all");
  await expect(page.getByTestId("allowance-core-peak-8C")).toHaveText("never beyond 8 °C");
  await expect(page.getByTestId("allowance-air-above-8C")).toHaveText("at most 180 min in all, at most 120 min at a stretch");
  await expect(page.getByTestId("rules-table").locator("thead")).toContainText("Allowed beyond it");
  await page.getByTestId("rules-table").scrollIntoViewIfNeeded();
  await page.screenshot({ path: "test-results/walkthrough-review-rules.png", fullPage: true });
});

test("a new review starts from the trace's previous review's definitions and keeps what was typed after an error", async ({ page }) => {
  await page.goto(`/reviews/new?trace=${ids.trace}`);
  await expect(page.getByTestId("preselected-from")).toContainText("this trace's previous review, Walkthrough review");
  await expect(page.locator("#f-traceId")).toHaveValue(ids.trace);
  await expect(page.locator("#f-productId")).toHaveValue(ids.product);
  await expect(page.locator("#f-packId")).toHaveValue(ids.pack);
  await expect(page.locator("#f-limitsId")).toHaveValue(ids.limits);
  await expect(page.locator("#f-model")).toHaveValue("auto");
  // without a trace: the most recent review's combination (this spec's review is the newest)
  await page.goto("/reviews/new");
  await expect(page.getByTestId("preselected-from")).toContainText("the most recent review, Walkthrough review");
  await expect(page.locator("#f-packId")).toHaveValue(ids.pack);

  // an error keeps every field as the user left it
  await page.goto(`/reviews/new?trace=${ids.trace}`);
  await page.getByLabel("Title").fill("Walkthrough, second look");
  await page.locator("#f-packId").selectOption("");
  await page.locator("#f-model").selectOption("lumped");
  await page.getByText("Propagate input uncertainty (optional)").click();
  await page.getByTestId("uncertainty-json").fill("{not json");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("error-uncertainty")).toContainText("not valid JSON");
  await expect(page.getByLabel("Title")).toHaveValue("Walkthrough, second look");
  await expect(page.locator("#f-productId")).toHaveValue(ids.product);
  await expect(page.locator("#f-packId")).toHaveValue("");
  await expect(page.locator("#f-limitsId")).toHaveValue(ids.limits);
  await expect(page.locator("#f-model")).toHaveValue("lumped");
  await expect(page.getByTestId("uncertainty-json")).toHaveValue("{not json");
  await page.screenshot({ path: "test-results/walkthrough-new-review-error.png", fullPage: true });
});

test("the audit page names the account of a sign-in, says an unknown address has no account, and keeps the hash inside its card", async ({ page, browser }) => {
  // a refused sign-in for an address no account has (invented address), from a browser with no session
  const anon = await browser.newContext({ storageState: { cookies: [], origins: [] } });
  const p = await anon.newPage();
  await p.goto("/sign-in");
  await p.getByLabel("E-mail").fill("nobody.walkthrough@example.test");
  await p.getByLabel("Password").fill("not-a-password");
  await p.getByRole("button", { name: "Sign in" }).click();
  await expect(p.getByTestId("sign-in-error")).toBeVisible();
  await anon.close();

  await page.goto(`/audit?q=${encodeURIComponent("nobody.walkthrough@example.test")}`);
  const refused = page.getByTestId("audit-table").locator("tbody tr").first();
  await expect(refused).toContainText("sign-in-refused");
  await expect(refused).toContainText("account: nobody.walkthrough@example.test (no account has this address)");
  await expect(refused).toContainText("refused: no account has this address");
  await expect(refused).not.toContainText("not found");

  await page.goto(`/audit?action=sign-in&q=${encodeURIComponent(TEST_EMAIL.admin)}`);
  await expect(page.getByTestId("filter-action")).toHaveValue("sign-in");
  const signIn = page.getByTestId("audit-table").locator("tbody tr").first();
  await expect(signIn).toContainText(`<${TEST_EMAIL.admin}>`);
  await expect(signIn).not.toContainText("not found");

  await page.goto("/audit");
  const hash = page.getByTestId("audit-hash").first();
  await expect(hash).toHaveText(/^[0-9a-f]{10}…$/);
  await expect(hash).toHaveAttribute("data-full", /^[0-9a-f]{64}$/);
  await page.screenshot({ path: "test-results/walkthrough-audit.png", fullPage: true });
  // the refused address (no spaces to wrap at) must not push the hash column out of the card
  const card = (await page.getByTestId("audit-table").locator("xpath=ancestor::section[1]").boundingBox())!;
  const cell = (await hash.locator("xpath=ancestor::td[1]").boundingBox())!;
  expect(cell.x + cell.width).toBeLessThanOrEqual(card.x + card.width);
});

test("the audit filters offer every kind and action the log holds; an unknown one is named and shows no entries, never all", async ({ page }) => {
  await page.goto("/audit");
  for (const kind of ["monitor", "alert", "delivery", "shipment", "lane", "logger", "shipmentLogger", "shipmentReview"]) {
    await expect(page.getByTestId("filter-entity").locator(`option[value="${kind}"]`), kind).toHaveCount(1);
  }
  for (const action of ["signature-refused", "resume", "readings", "raise", "clear", "deliver", "close", "revoke", "cancel", "seal"]) {
    await expect(page.getByTestId("filter-action").locator(`option[value="${action}"]`), action).toHaveCount(1);
  }
  // a mistyped action (there is no "sign-off" action: sign-offs are "sign") and kind
  await page.goto("/audit?action=sign-off");
  await expect(page.getByTestId("audit-filter-unknown")).toHaveText("No entries shown: the log has no action “sign-off”. Choose from the lists (“any” shows every entry).");
  await expect(page.getByTestId("audit-table")).toHaveCount(0);
  await expect(page.getByTestId("pager-summary")).toHaveCount(0);
  await page.screenshot({ path: "test-results/walkthrough-audit-unknown.png", fullPage: true });
  await page.goto("/audit?kind=shipments"); // "kind", the label's word, is read as entity
  await expect(page.getByTestId("audit-filter-unknown")).toContainText("no kind of record “shipments”");
  await expect(page.getByTestId("audit-table")).toHaveCount(0);
  const csv = await page.request.get("/audit/export.csv?action=sign-off");
  expect(csv.status()).toBe(400);
  expect(await csv.text()).toContain("no action “sign-off”");
  // a known one filters as before
  await page.goto("/audit?entity=user&action=sign-in");
  await expect(page.getByTestId("audit-filter-unknown")).toHaveCount(0);
  await expect(page.getByTestId("audit-table").locator("tbody tr").first()).toContainText("sign-in");
});
