import { test, expect, type Page } from "@playwright/test";
import { readFileSync } from "node:fs";
import { createHash } from "node:crypto";
import path from "node:path";
import { saveLumpedProduct, saveTemplateLimits } from "./helpers/seedDefinitions";
import { roleState } from "./helpers/auth";

// What an auditor and a QA reviewer need beside the review: the audit log, the original file,
// re-checks, the report's parameters, duplicate uploads and the lists. One shared database, in order.
const DEMO = path.join(__dirname, "../../public/demo");
const routeFile = path.join(DEMO, "route7-tote3.csv");
const routeBytes = readFileSync(routeFile);
const routeSha = createHash("sha256").update(routeBytes).digest("hex");

test.describe.configure({ mode: "serial" });

let traceId = "";
let reviewId = "";

async function uploadViaApi(page: Page, file: string, name: string): Promise<string> {
  const res = await page.request.post("/api/traces", {
    multipart: { file: { name: path.basename(file), mimeType: "text/csv", buffer: readFileSync(file) }, name, options: "{}" },
  });
  expect(res.status()).toBe(201);
  return ((await res.json()) as { id: string }).id;
}

test("set up: a trace, a product, a limit set and a review", async ({ page }) => {
  traceId = await uploadViaApi(page, routeFile, "Auditor route 7");
  await saveLumpedProduct(page, "Auditor meal tray");
  await saveTemplateLimits(page, "chilled-cold-holding-5C");
  await page.goto(`/reviews/new?trace=${traceId}`);
  await page.getByLabel("Title").fill("Auditor review of route 7");
  await page.locator("#f-productId").selectOption({ label: "Auditor meal tray v1" });
  await page.locator("#f-limitsId").selectOption({ label: "Chilled food, 5 °C / 4 h (from template) v1" });
  await page.locator("#f-packId").selectOption(""); // the form preselects the last review's pack and model
  await page.locator("#f-model").selectOption("auto");
  await page.getByRole("button", { name: "Run review" }).click();
  await expect(page.getByRole("heading", { name: "Review: Auditor review of route 7" })).toBeVisible();
  reviewId = page.url().split("/reviews/")[1]!.split(/[?#]/)[0]!;
  expect(reviewId).toMatch(/^\w+$/);
});

test("the original logger file downloads from its trace page, byte for byte, and the download is audited", async ({ page }) => {
  await page.goto(`/traces/${traceId}`);
  await expect(page.getByTestId("trace-sha256")).toHaveText(routeSha);
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("download-original").click()]);
  expect(download.suggestedFilename()).toBe("route7-tote3.csv");
  const saved = readFileSync((await download.path())!);
  expect(Buffer.compare(saved, routeBytes)).toBe(0);
  const head = await page.request.get(`/traces/${traceId}/original`);
  expect(head.headers()["x-corelag-sha256"]).toBe(routeSha);
  await page.goto(`/audit?object=${traceId}&action=export`);
  await expect(page.getByTestId("audit-format").first()).toHaveText("(original)");
});

test("re-check this review: re-imported and re-run, shown, and recorded in the audit log", async ({ page }) => {
  await page.goto(`/reviews/${reviewId}`);
  await page.getByRole("button", { name: "Re-check this review" }).click();
  await expect(page.getByTestId("recheck-result")).toContainText("Reproduced: same trace series, same definitions, same result hash");
  await page.getByTestId("recheck-result").getByRole("link", { name: /audit entry #\d+/ }).click();
  await expect(page.getByTestId("audit-table")).toContainText("verify reproduced");
  await expect(page.getByTestId("audit-table")).toContainText("Auditor review of route 7");
  // the review page remembers the last re-check
  await page.goto(`/reviews/${reviewId}`);
  await expect(page.getByTestId("recheck-last")).toContainText("reproduced");
  await page.getByTestId("recheck").screenshot({ path: "test-results/review-recheck.png" });
});

test("the report shows every parameter of the product and limit set it used", async ({ page }) => {
  await page.goto(`/reviews/${reviewId}/report`);
  const params = page.getByTestId("report-parameters");
  await expect(params.getByTestId("param-product-mass_kg")).toHaveText(/mass\s*0\.45\s*kg/);
  await expect(params.getByTestId("param-product-properties.cp_J_kgK")).toHaveText(/specific heat cp\s*3600\s*J\/kg·K/);
  await expect(params.getByTestId("param-product-h_W_m2K")).toHaveText(/surface coefficient h\s*2\.5\s*W\/m²·K/);
  await expect(params.getByTestId("parameters-limits")).toContainText("core above 5 °C, at most 240 min in all");
  await expect(params.getByTestId("parameters-product")).toContainText(/SHA-256 [0-9a-f]{64}/);
  await expect(params).toContainText("No pack: the product's own surface coefficient was used.");
  await params.screenshot({ path: "test-results/report-parameters.png" });
});

test("the audit log shows names, links, raw ids and export formats, filters, searches and exports CSV", async ({ page }) => {
  // an export, so that a format shows
  expect((await page.request.get(`/reviews/${reviewId}/export/findings.csv`)).status()).toBe(200);
  await page.goto("/audit");
  await expect(page.getByTestId("chain-head")).toContainText(/\d+ entries; newest #\d+/);
  const table = page.getByTestId("audit-table");
  await expect(table.getByRole("link", { name: "Auditor route 7" }).first()).toHaveAttribute("href", `/traces/${traceId}`);
  await expect(table.getByRole("link", { name: "Auditor meal tray v1" }).first()).toHaveAttribute("href", /^\/definitions\//);
  await expect(table.getByRole("link", { name: "Auditor review of route 7" }).first()).toHaveAttribute("href", `/reviews/${reviewId}`);
  await expect(table.getByText(reviewId).first()).toBeVisible(); // raw id kept for cross-checking
  await expect(table.getByTestId("audit-format").first()).toHaveText("(findings.csv)");
  await expect(page.getByTestId(/^audit-row-/).filter({ hasText: "verify" }).getByTestId("audit-summary")).toHaveText("reproduced");
  await page.screenshot({ path: "test-results/audit.png", fullPage: true });

  // filter by kind and search by a title
  await page.getByTestId("filter-entity").selectOption("review");
  await page.getByTestId("search-input").fill("auditor review");
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page).toHaveURL(/entity=review/);
  const rows = page.getByTestId("audit-table").locator("tbody tr");
  await expect(rows).toHaveCount(3); // run, verify, export
  await expect(page.getByTestId("pager-summary").first()).toHaveText("Entries 1–3 of 3");
  // a date range with nothing in it
  await page.getByTestId("filter-from").fill("2020-01-01");
  await page.getByTestId("filter-to").fill("2020-01-02");
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page.getByText("No entries match.")).toBeVisible();

  // CSV of the filtered view
  await page.goto(`/audit?entity=review&q=${encodeURIComponent("auditor review")}`);
  const href = (await page.getByTestId("audit-csv").getAttribute("href"))!;
  const csv = await (await page.request.get(href)).text();
  const lines = csv.trim().split("\r\n");
  expect(lines[0]).toBe("seq,at_utc,action,entity,entity_id,kind,name,link,export_format,actor,details_json,prev_hash,hash");
  expect(lines.slice(1).map((l) => l.split(",")[2])).toEqual(["run", "verify", "export"]);
  expect(lines[3]).toContain(`,review,${reviewId},,Auditor review of route 7,http://127.0.0.1:`);
  // the actor is the signed-in user (the e2e specs run as the test administrator)
  expect(lines[3]).toContain(",findings.csv,Ilse Admin (demo) <admin@corelag.test>,");

  // a definition named in the log opens read-only, with its parameters and versions
  await page.goto("/audit?entity=definition");
  await page.getByTestId("audit-table").getByRole("link", { name: "Auditor meal tray v1" }).click();
  await expect(page.getByRole("heading", { name: "Auditor meal tray (version 1)", exact: true })).toBeVisible();
  await expect(page.getByTestId("param-product-mass_kg")).toHaveText(/mass\s*0\.45\s*kg/);
  await expect(page.getByTestId("definition-versions")).toContainText("version 1");

  // the whole chain, re-checked only on request
  await page.goto("/audit");
  await expect(page.getByTestId("chain-status")).toHaveCount(0);
  await page.getByTestId("verify-chain").click();
  await expect(page.getByTestId("chain-status")).toContainText("the chain is intact and signed");
  const recorded = Number((await page.getByTestId("chain-status").textContent())!.match(/recorded as entry #(\d+)/)![1]);
  // the check is recorded in the log; later views check only the entries after the head it verified
  await page.goto("/audit");
  await expect(page.getByTestId("chain-last-full")).toContainText(`(entry #${recorded}): the chain was intact and signed up to entry #${recorded - 1}, and every record matched.`);
  await expect(page.getByTestId("chain-since")).toContainText(/entry #\d+ still has the hash verified/);
  await expect(page.getByTestId(`audit-row-${recorded}`)).toContainText("verify chain intact");
  await expect(page.getByTestId(`audit-row-${recorded}`)).toContainText(`audit chain: entries 1–${recorded - 1} checked in full`);
  await page.waitForLoadState("networkidle");
  await page.getByTestId("chain-check").screenshot({ path: "test-results/audit-light-check.png" });
});

test("uploading a file already stored warns and links to it; the trace page lists the same file", async ({ page }) => {
  await page.goto("/traces");
  await page.getByLabel("Logger file (CSV)").setInputFiles(routeFile);
  await expect(page.getByTestId("duplicate-warning")).toContainText("This exact file (same SHA-256) is already stored as");
  await page.getByTestId("duplicate-warning").screenshot({ path: "test-results/upload-duplicate.png" });
  await expect(page.getByTestId("duplicate-warning").getByRole("link", { name: "Auditor route 7" })).toHaveAttribute("href", `/traces/${traceId}`);
  // another file: no warning
  await page.getByLabel("Logger file (CSV)").setInputFiles({ name: "fresh.csv", mimeType: "text/csv", buffer: Buffer.from("Time,Temp\n2026-01-01T00:00:00Z,4.1\n2026-01-01T00:01:00Z,4.2\n2026-01-01T00:02:00Z,4.4\n") });
  await expect(page.getByTestId("preview")).toBeVisible();
  await expect(page.getByTestId("duplicate-warning")).toHaveCount(0);
  // uploading the same bytes anyway is allowed, and the new trace points at the old one
  await page.getByLabel("Logger file (CSV)").setInputFiles(routeFile);
  await expect(page.getByTestId("duplicate-warning")).toBeVisible();
  await page.locator("#f-name").fill("Auditor route 7, again");
  await page.getByRole("button", { name: "Upload and import" }).click();
  await expect(page.getByTestId("same-file")).toContainText("Auditor route 7");
  await page.screenshot({ path: "test-results/trace-original.png" });
});

test("the home page lists traces never reviewed; the traces list searches and counts reviews", async ({ page }) => {
  const probeId = await uploadViaApi(page, path.join(DEMO, "probe-test.csv"), "Auditor probe file");
  await page.goto("/");
  await expect(page.getByTestId("attention-unreviewed").getByRole("link", { name: "Auditor probe file" })).toHaveAttribute("href", `/traces/${probeId}`);
  await page.goto("/traces");
  await page.getByTestId("search-input").fill("auditor probe");
  await page.getByRole("button", { name: "Search" }).click();
  await expect(page.getByTestId("trace-list").locator("tbody tr")).toHaveCount(1);
  await expect(page.getByTestId("trace-list")).toContainText("never reviewed");
  await page.goto("/");
  await page.screenshot({ path: "test-results/home-attention.png" });
  await page.goto("/traces?q=auditor%20probe");
  await page.getByTestId("search-input").fill(routeSha.slice(0, 10));
  await page.getByRole("button", { name: "Search" }).click();
  await expect(page.getByTestId("trace-list")).toContainText("Auditor route 7");
  await expect(page.getByTestId("trace-list")).not.toContainText("Auditor probe file");
  // the reviews list searches too
  await page.goto("/");
  await page.getByTestId("search-input").fill("auditor review");
  await page.getByRole("button", { name: "Filter" }).click();
  await expect(page.getByTestId("review-list").locator("tbody tr")).toHaveCount(1);
});

let loggerEdit = "";

test("set up: a logger in the register (as the administrator, who may register one)", async ({ page }) => {
  await page.goto("/loggers");
  await page.locator("#f-serial").fill("AUD-0001"); // invented serial
  await page.locator("#f-accuracyK").fill("0.5");
  await page.getByRole("button", { name: "Register" }).click();
  await expect(page.getByTestId("logger-register")).toContainText("AUD-0001");
  loggerEdit = (await page.getByTestId("logger-register").getByRole("link", { name: "Edit" }).getAttribute("href"))!;
  expect(loggerEdit).toMatch(/^\/loggers\?edit=\w+$/);
});

// The walkthrough found an auditor offered the logger register's Register and Edit forms and the whole
// new-shipment form: submitting was refused on the server, but the pages should not offer what the role cannot do.
test.describe("as the auditor", () => {
  test.use({ storageState: roleState("auditor") });

  test("the logger register, the new shipment page and the shipments list offer an auditor no write form, and say who can", async ({ page }) => {
    await page.goto("/loggers");
    await expect(page.getByTestId("user-role")).toHaveText("auditor");
    await expect(page.getByTestId("logger-register")).toContainText("AUD-0001");
    await expect(page.getByTestId("logger-register").getByRole("link", { name: "Edit" })).toHaveCount(0);
    await expect(page.getByTestId("read-only")).toHaveText("Your role (auditor) reads this page; this needs the admin or reviewer role.");
    await expect(page.locator("#f-serial")).toHaveCount(0);
    await page.screenshot({ path: "test-results/auditor-loggers.png", fullPage: true });
    // an edit address typed by hand shows no edit form either
    await page.goto(loggerEdit);
    await expect(page.getByRole("heading", { name: "Edit AUD-0001" })).toHaveCount(0);
    await expect(page.locator("main form")).toHaveCount(0);

    await page.goto("/shipments/new");
    await expect(page.getByTestId("read-only")).toHaveText("Your role (auditor) reads this page; this needs the admin or reviewer role.");
    await expect(page.locator("main form")).toHaveCount(0);
    await page.screenshot({ path: "test-results/auditor-new-shipment.png", fullPage: true });
    await page.goto("/shipments");
    await expect(page.getByTestId("new-shipment")).toHaveCount(0);
  });
});
