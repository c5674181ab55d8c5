// Tests only: one account per role (the demo accounts) in the database named by DATABASE_URL, with the
// password CORELAG_DEMO_PASSWORD. Used by the e2e server and tests/helpers/accounts.ts. Does nothing when
// users exist.
import { createDemoAccounts } from "../lib/services/users";

createDemoAccounts({ kind: "system", what: "test" }).then(
  (made) => {
    console.log(JSON.stringify(made.map((a) => ({ role: a.role, email: a.email }))));
    process.exit(0);
  },
  (e: unknown) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  },
);
