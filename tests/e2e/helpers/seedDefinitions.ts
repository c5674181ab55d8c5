// Definitions the end-to-end specs create through the editors, as a user would, in one place.
import { expect, type Page } from "@playwright/test";

/** A bare lumped product (the demo tray's numbers unless given: 0.45 kg, 0.062 m², h 2.5 W/m²K, cp 3600 J/kgK, 3.2 °C). */
export async function saveLumpedProduct(
  page: Page,
  name: string,
  v: { initial_C?: string; mass_kg?: string; area_m2?: string; h_W_m2K?: string; cp_J_kgK?: string } = {},
): Promise<void> {
  await page.goto("/products");
  await page.getByTestId("product-name").fill(name);
  await page.getByTestId("initial_C").fill(v.initial_C ?? "3.2");
  await page.getByTestId("mass_kg").fill(v.mass_kg ?? "0.45");
  await page.getByTestId("area_m2").fill(v.area_m2 ?? "0.062");
  await page.getByTestId("h_W_m2K").fill(v.h_W_m2K ?? "2.5");
  await page.getByTestId("cp_J_kgK").fill(v.cp_J_kgK ?? "3600");
  await page.getByRole("button", { name: "Save product" }).click();
  await expect(page.getByTestId("product-list")).toContainText(name);
}

/** A limit set saved from one of the templates (lib/exposure/templates.ts). */
export async function saveTemplateLimits(page: Page, template: string): Promise<void> {
  await page.goto("/limits");
  await page.getByTestId("template-select").selectOption(template);
  await page.getByRole("button", { name: "Save limit set" }).click();
  await expect(page.getByTestId("limits-list")).toBeVisible();
}
