import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { roleState, TEST_PASSWORD } from "./helpers/auth";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";

// Issue 13, electronic signatures: a reviewer signs off by re-entering the password; the review page and the
// report show the signer's name, the time and the meaning; an auditor opens and exports but has no write
// controls, and a post it makes anyway is refused.
const DEMO = path.resolve(__dirname, "../../public/demo");
let reviewUrl = "";

test.describe("as the reviewer", () => {
  test.use({ storageState: roleState("reviewer") });

  test("a reviewer signs off with the password; a wrong password is refused; the report shows name, time and meaning", async ({ page, request }) => {
    const up = await request.post("/api/traces", { multipart: { file: { name: "route7-tote3.csv", mimeType: "text/csv", buffer: readFileSync(path.join(DEMO, "route7-tote3.csv")) }, name: "Signature trace", options: "{}" } });
    expect(up.status()).toBe(201);
    const { id: traceId } = (await up.json()) as { id: string };
    await saveLumpedProduct(page, "Signature tray");
    await saveTemplateLimits(page, "chilled-cold-holding-5C");
    await page.goto(`/reviews/new?trace=${traceId}`);
    await page.getByLabel("Title").fill("Signature check");
    await page.locator("#f-productId").selectOption({ label: "Signature tray v1" });
    await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 5 °C / 4 h (from template) v1" });
    await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
    await page.locator("#f-model").selectOption("auto");
    await page.getByRole("button", { name: "Run review" }).click();
    await expect(page.getByRole("heading", { name: "Review: Signature check" })).toBeVisible();
    reviewUrl = page.url().split(/[?#]/)[0]!;
    await expect(page.getByTestId("signing-as")).toContainText("Tomas Reviewer (demo)");
    const suggested = (await page.getByTestId("outcome-value").textContent())!;
    const decision = suggested === "accept" ? "accept" : suggested === "hold for review" ? "hold" : "reject";
    await page.locator("#f-decision").selectOption(decision);
    await page.getByLabel("Your password").fill("not the password");
    await page.getByRole("button", { name: "Sign off" }).click();
    await expect(page.getByTestId("error-password")).toHaveText(/^the password is wrong; nothing was signed \(\d more wrong passwords? locks? the account for 15 minutes\)$/);
    await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
    await page.getByLabel("Your password").fill(TEST_PASSWORD);
    await page.getByRole("button", { name: "Sign off" }).click();
    await expect(page.getByTestId("review-status")).toHaveText("signed off (final)");
    const signature = page.getByTestId("signature");
    await expect(signature).toContainText("Tomas Reviewer (demo)");
    await expect(signature).toContainText(/\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}/);
    await expect(signature).toContainText(/Meaning: (Released|Held|Rejected):/);
    await page.screenshot({ path: "test-results/e2e-signature-review.png", fullPage: true });
    await page.getByTestId("report-link").click();
    await expect(page.getByTestId("signature")).toContainText("Tomas Reviewer (demo)");
    await expect(page.getByTestId("signature")).toContainText(/Meaning: (Released|Held|Rejected):/);
    await page.screenshot({ path: "test-results/e2e-signature-report.png", fullPage: true });
    const json = await (await request.get(`${reviewUrl}/export/review.json`)).text();
    expect(json).toContain('"by": "Tomas Reviewer (demo)"');
    expect(json).toMatch(/"meaning": "(Released|Held|Rejected):/);
  });
});

test.describe("as the auditor", () => {
  test.use({ storageState: roleState("auditor") });

  test("an auditor opens and exports but sees no write controls, and a post anyway is refused", async ({ page, request }) => {
    expect(reviewUrl).not.toBe("");
    await page.goto(reviewUrl);
    await expect(page.getByTestId("user-role")).toHaveText("auditor");
    await expect(page.getByRole("button", { name: "Sign off" })).toHaveCount(0);
    await expect(page.getByRole("button", { name: "Rename" })).toHaveCount(0);
    expect((await request.get(`${reviewUrl}/export/findings.csv`)).status()).toBe(200);
    await page.goto("/traces");
    await page.screenshot({ path: "test-results/e2e-auditor-traces.png", fullPage: true });
    // no page offers the auditor a control its role cannot use: each says who can instead
    for (const url of ["/traces", "/reviews/new", "/products", "/packs", "/limits", "/design/profiles", "/monitors"]) {
      await page.goto(url);
      await expect(page.getByTestId("read-only").first(), url).toContainText("Your role (auditor) reads this page");
      await expect(page.locator("main form:not([role=search]) button[type=submit]"), url).toHaveCount(0);
    }
    const res = await request.post("/api/traces", { multipart: { file: { name: "x.csv", mimeType: "text/csv", buffer: Buffer.from("time,air_C\n2026-06-16T00:00:00Z,4\n2026-06-16T00:10:00Z,5\n") }, options: "{}" } });
    expect(res.status()).toBe(403);
    expect(((await res.json()) as { error: string }).error).toContain("your role (auditor)");
  });
});
