// Stores the demo's design inputs in the end-to-end database (run as a subprocess by design.spec.ts,
// with DATABASE_URL set to the e2e server's file): the shaped tray, the tote, the design limit set and the
// full example plan, the summer profile and the probe test. Names end in "(design e2e)" so that other
// specs' definitions never match the same labels. Runs once: does nothing when they are already there.
import { readFileSync } from "node:fs";
import path from "node:path";
import { packSchema, productSchema } from "../../../lib/thermal/definitions";
import { limitSetSchema } from "../../../lib/exposure/limits";
import { EXAMPLE_PROFILES } from "../../../lib/design/profile";
import { importCsv } from "../../../lib/trace";
import { createDefinition, listLatestDefinitions } from "../../../lib/db/definitions";
import { createTrace } from "../../../lib/db/traces";
import { TEST_ACTOR } from "../../helpers/accounts";

const DEMO = path.join(__dirname, "../../../public/demo");
const SUFFIX = " (design e2e)";
const json = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));
const named = <T extends { name: string }>(x: T): T => ({ ...x, name: x.name + SUFFIX });

async function main() {
  if ((await listLatestDefinitions("product")).some((d) => d.name.endsWith(SUFFIX))) return;
  await createDefinition("product", named(productSchema.parse(json("ready-meal-shaped.product.json"))), TEST_ACTOR);
  await createDefinition("product", named(productSchema.parse(json("ready-meal.product.json"))), TEST_ACTOR);
  await createDefinition("pack", named(packSchema.parse(json("tote.pack.json"))), TEST_ACTOR);
  await createDefinition("limits", named(limitSetSchema.parse(json("tote-design.limits.json"))), TEST_ACTOR);
  await createDefinition("limits", named(limitSetSchema.parse(json("ready-meal.limits.json"))), TEST_ACTOR);
  await createDefinition("profile", named(EXAMPLE_PROFILES[0]!), TEST_ACTOR);
  const bytes = readFileSync(path.join(DEMO, "probe-test.csv"));
  await createTrace({ name: "Probe test" + SUFFIX, fileName: "probe-test.csv", bytes, imported: importCsv(bytes), actor: TEST_ACTOR });
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error(e);
    process.exit(1);
  },
);
