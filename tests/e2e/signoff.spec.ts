import { test, expect, type Page } from "@playwright/test";
import path from "node:path";
import { saveLumpedProduct } from "./helpers/seedDefinitions";
import { TEST_PASSWORD } from "./helpers/auth";

// Issue 9, "Records must say what the reviewer decided": the stored decision is the one chosen, and the
// comment required for a decision that differs from the suggestion is enforced against the STORED outcome.
const DEMO = path.join(__dirname, "../../public/demo");

/** A review of the demo trace that suggests reject: the demo air reaches 16.1 °C and a rule allows no time above 8 °C. */
async function rejectReview(page: Page, title: string): Promise<string> {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(path.join(DEMO, "route7-tote3.csv"));
  await expect(page.getByTestId("preview")).toBeVisible();
  await page.locator("#f-name").fill(`${title} trace`);
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("trace-samples")).toHaveText("361");
  const traceId = page.url().split("/").pop()!;

  await saveLumpedProduct(page, `${title} product`);

  await page.goto("/limits");
  await page.locator("#f-ls-name").fill(`${title} limits`);
  await page.getByLabel("rule 1 id").fill("air-above-8C");
  await page.getByLabel("rule 1 channel").selectOption("air");
  await page.getByLabel("rule 1 threshold").fill("8");
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toContainText(`${title} limits`);

  await page.goto(`/reviews/new?trace=${traceId}`);
  await page.getByLabel("Title").fill(title);
  await page.locator("#f-productId").selectOption({ label: `${title} product v1` });
  await page.locator("#f-limitsId").selectOption({ label: `${title} limits v1` });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
  await expect(page.getByTestId("outcome-value")).toHaveText("reject");
  return page.url();
}

test("hold for review with an empty comment is refused, keeps 'hold', and the record and report say HOLD", async ({ page, request }) => {
  const url = await rejectReview(page, "Sign-off sequence");
  const id = url.split("/").pop()!;

  // Exactly the sequence from the issue.
  await page.getByLabel("Your password").fill(TEST_PASSWORD);
  await page.locator("#f-decision").selectOption("hold");
  await page.getByRole("button", { name: "Sign off" }).click();
  await expect(page.getByTestId("error-comment")).toHaveText("a decision that differs from the suggested outcome needs a comment saying why");
  // after the refusal the form still shows what the reviewer chose
  await expect(page.locator("#f-decision")).toHaveValue("hold");
  await expect(page.getByLabel("Your password")).toHaveValue(TEST_PASSWORD);
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
  await page.getByLabel(/^Comment/).fill("Core probed at arrival: 4.1 °C; held for the QA lead.");
  await page.getByRole("button", { name: "Sign off" }).click();
  await expect(page.getByTestId("review-status")).toHaveText("signed off (final)");
  await expect(page.getByTestId("decision")).toContainText("decision hold for review by Ilse Admin (demo)");
  await expect(page.getByTestId("sign-comment")).toContainText("Core probed at arrival: 4.1 °C");

  // the stored record, as the export reads it
  const json = (await (await request.get(`/reviews/${id}/export/review.json`)).json()) as Record<string, unknown>;
  expect(JSON.stringify(json)).toMatch(/"decision":"hold"/);
  const csv = await (await request.get(`/reviews/${id}/export/findings.csv`)).text();
  expect(csv).toMatch(/^suggested_outcome,reject\r?$/m);
  expect(csv).toMatch(/^decision,hold\r?$/m);

  // the printable report
  await page.goto(`/reviews/${id}/report`);
  await expect(page.getByTestId("outcome")).toContainText("reject");
  await expect(page.getByTestId("decision")).toContainText("decision hold for review by Ilse Admin (demo)");
  await expect(page.getByTestId("decision")).not.toContainText("accept");
});

test("a forged post (decision=accept&suggested=accept) on a reject review is refused without a comment", async ({ page, request }) => {
  const url = await rejectReview(page, "Forged sign-off");
  const id = url.split("/").pop()!;
  // Post what a forged form would: the old hidden field, claiming the suggestion was accept.
  await page.getByLabel("Your password").fill(TEST_PASSWORD);
  await page.locator("#f-decision").selectOption("accept");
  await page.locator("form[aria-label='Sign off']").evaluate((form) => {
    const input = document.createElement("input");
    input.type = "hidden";
    input.name = "suggested";
    input.value = "accept";
    form.appendChild(input);
  });
  await page.getByRole("button", { name: "Sign off" }).click();
  await expect(page.getByTestId("error-comment")).toHaveText("a decision that differs from the suggested outcome needs a comment saying why");
  await page.reload();
  await expect(page.getByTestId("review-status")).toHaveText("open: not yet signed off");
  const csv = await (await request.get(`/reviews/${id}/export/findings.csv`)).text();
  expect(csv).toMatch(/^decision,not signed off\r?$/m);
});
