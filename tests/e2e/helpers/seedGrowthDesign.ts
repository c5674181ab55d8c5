// Stores design inputs with a growth rule in the end-to-end database (run as a subprocess by
// consequences.spec.ts, with DATABASE_URL set to the e2e server's file): the demo's shaped tray with an
// invented growth model, the demo tote, a limit set with one growth rule and the summer example profile.
// Names end in "(growth e2e)". Runs once: does nothing when they are already there.
import { readFileSync } from "node:fs";
import path from "node:path";
import { packSchema, productSchema } from "../../../lib/thermal/definitions";
import { limitSetSchema } from "../../../lib/exposure/limits";
import { EXAMPLE_PROFILES } from "../../../lib/design/profile";
import { createDefinition, listLatestDefinitions } from "../../../lib/db/definitions";

const DEMO = path.join(__dirname, "../../../public/demo");
import { GROWTH_LIMITS, GROWTH_MODEL, GROWTH_SUFFIX as SUFFIX } from "./growthInputs";
import { TEST_ACTOR } from "../../helpers/accounts";

const json = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));

async function main() {
  if ((await listLatestDefinitions("product")).some((d) => d.name.endsWith(SUFFIX))) return;
  const tray = json("ready-meal-shaped.product.json");
  await createDefinition("product", productSchema.parse({ ...tray, name: tray.name + SUFFIX, consequences: [GROWTH_MODEL] }), TEST_ACTOR);
  const tote = json("tote.pack.json");
  await createDefinition("pack", packSchema.parse({ ...tote, name: tote.name + SUFFIX }), TEST_ACTOR);
  await createDefinition("limits", limitSetSchema.parse(GROWTH_LIMITS), TEST_ACTOR);
  await createDefinition("profile", { ...EXAMPLE_PROFILES[0]!, name: EXAMPLE_PROFILES[0]!.name + SUFFIX }, TEST_ACTOR);
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error(e);
    process.exit(1);
  },
);
