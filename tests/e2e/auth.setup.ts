// Signs in once as each test account (one per role, seeded by scripts/e2e-server.ts) and saves the
// browser state for the specs (tests/e2e/helpers/auth.ts roleState).
import { test as setup } from "@playwright/test";
import { ROLES } from "../../lib/access/roles";
import { roleState, signInAs } from "./helpers/auth";

for (const role of ROLES) {
  setup(`sign in as ${role}`, async ({ page }) => {
    await signInAs(page, role);
    await page.context().storageState({ path: roleState(role) });
  });
}
