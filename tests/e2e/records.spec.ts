import { test, expect } from "@playwright/test";
import { appendFileSync, readFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import path from "node:path";
import Database from "better-sqlite3";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";

// Issue 12 in the app: the review page and report say when the record was verified against which chain
// head and key; the audit page shows the signing key and the last anchor, and whether the chain still holds it.
const ROOT = path.resolve(__dirname, "../..");
const DB_FILE = path.join(ROOT, "test-results", "e2e-db", "e2e.db"); // scripts/e2e-server.ts
const routeFile = path.join(ROOT, "public/demo/route7-tote3.csv");

test.describe.configure({ mode: "serial" });

let reviewId = "";

function corelag(...args: string[]) {
  return spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, DATABASE_URL: `file:${DB_FILE}` } });
}

test("set up: a trace, a product, a limit set and a review", async ({ page }) => {
  const res = await page.request.post("/api/traces", {
    multipart: { file: { name: "route7-tote3.csv", mimeType: "text/csv", buffer: readFileSync(routeFile) }, name: "Records route 7", options: "{}" },
  });
  expect(res.status()).toBe(201);
  const traceId = ((await res.json()) as { id: string }).id;
  await saveLumpedProduct(page, "Records meal tray");
  await saveTemplateLimits(page, "chilled-cold-holding-5C");
  await page.goto(`/reviews/new?trace=${traceId}`);
  await page.getByLabel("Title").fill("Records review of route 7");
  await page.locator("#f-productId").selectOption({ label: "Records meal tray v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 5 °C / 4 h (from template) v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: Records review of route 7" })).toBeVisible();
  reviewId = page.url().split("/reviews/")[1]!.split(/[?#]/)[0]!;
});

test("the review page and the report say: verified at TIME against chain head N, key FINGERPRINT", async ({ page }) => {
  const anchor = corelag("anchor");
  expect(anchor.status).toBe(0);
  const head = JSON.parse(anchor.stdout) as { seq: number; hash: string; key_fingerprint: string };
  const short = head.key_fingerprint.slice(0, 16).replace(/(.{4})(?=.)/g, "$1 ");
  await page.goto(`/reviews/${reviewId}`);
  await expect(page.getByTestId("record-verified-line")).toHaveText(new RegExp(`^Record verified at \\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d:\\d\\d UTC against chain head ${head.seq}, key ${short}\\.$`));
  await page.goto(`/reviews/${reviewId}/report`);
  await expect(page.getByTestId("record-verified-line")).toContainText(`against chain head ${head.seq}, key ${short}`);
  await expect(page.getByTestId("report-chain-head")).toHaveText(`Audit chain head at printing: entry ${head.seq}, hash ${head.hash}, signed by key ${head.key_fingerprint}.`);
  await page.waitForLoadState("networkidle"); // a late re-render must not detach the element mid-shot
  await page.screenshot({ path: "test-results/records-report-verified.png", fullPage: true });
});

test("a review changed behind the application's back fails its record check, by name", async ({ page }) => {
  // an open review's title may change in the database (rename), but only the app records it in the chain
  const d = new Database(DB_FILE);
  const title = d.prepare(`SELECT "title" FROM "Review" WHERE "id" = ?`).pluck().get(reviewId) as string;
  try {
    d.prepare(`UPDATE "Review" SET "title" = ? WHERE "id" = ?`).run("Quietly renamed", reviewId);
    await page.goto(`/reviews/${reviewId}`);
    await expect(page.getByTestId("record-verified-line")).toContainText("Record check FAILED");
    await expect(page.getByTestId("record-findings")).toContainText(`row-altered: review ${reviewId} no longer matches the content recorded by entry`);
    await page.waitForLoadState("networkidle"); // a late re-render must not detach the element mid-shot
  await page.screenshot({ path: "test-results/records-review-failed.png", fullPage: true });
  } finally {
    d.prepare(`UPDATE "Review" SET "title" = ? WHERE "id" = ?`).run(title, reviewId);
    d.close();
  }
  await page.goto(`/reviews/${reviewId}`);
  await expect(page.getByTestId("record-verified-line")).toContainText("Record verified at");
});

test("the audit page shows the signing key and the last anchor, and whether the chain still contains it", async ({ page }) => {
  const head = JSON.parse(corelag("anchor").stdout) as { seq: number; key_fingerprint: string; hash: string; chain: string; at: string };
  const short = head.key_fingerprint.slice(0, 16).replace(/(.{4})(?=.)/g, "$1 ");
  await page.goto("/audit");
  await expect(page.getByTestId("signing-key")).toHaveText(`Entries are signed with key ${short}.`);
  await expect(page.getByTestId("anchor-status")).toContainText(`Last anchor: entry #${head.seq}`);
  await expect(page.getByTestId("anchor-status")).toContainText("The chain still contains it.");
  // an anchor the chain does not hold (the head's hash altered): shown as such
  appendFileSync(`${DB_FILE}.anchors.jsonl`, JSON.stringify({ ...head, hash: "f".repeat(64), anchored_at: new Date().toISOString() }) + "\n");
  await page.goto("/audit");
  await expect(page.getByTestId("anchor-status")).toContainText(`The chain no longer contains it: entry ${head.seq} no longer has the anchored hash ffffffffffffffff…`);
  await page.waitForLoadState("networkidle"); // a late re-render must not detach the element mid-shot
  await page.screenshot({ path: "test-results/records-audit-anchor.png", fullPage: true });
  // put the good anchor back last, for the tests that follow
  appendFileSync(`${DB_FILE}.anchors.jsonl`, JSON.stringify(head) + "\n");
});
