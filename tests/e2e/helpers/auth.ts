// Signing in for end-to-end specs. The setup project (tests/e2e/auth.setup.ts) signs in once per role
// through the sign-in page and saves each browser state; every spec runs as the administrator unless it
// says otherwise:  test.use({ storageState: roleState("auditor") });
import path from "node:path";
import { expect, type Page } from "@playwright/test";
import type { Role } from "../../../lib/access/roles";
import { TEST_EMAIL, TEST_PASSWORD } from "../../helpers/accounts";

export { TEST_EMAIL, TEST_PASSWORD };

/** The saved browser state (cookies) of the signed-in test account with this role. */
export function roleState(role: Role): string {
  return path.resolve("test-results", "e2e-auth", `${role}.json`);
}

/** Signs in through the sign-in page, as a user would. */
export async function signInAs(page: Page, role: Role): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(TEST_EMAIL[role]);
  await page.getByLabel("Password").fill(TEST_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByTestId("user-role")).toHaveText(role);
}
