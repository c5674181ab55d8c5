import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { testDatabaseUrl } from "../helpers/database";

// The demo as `npm start` loads it, then the sizing study the size page offers for it.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-demo-sizing-"));
const url = testDatabaseUrl(dir, "demo.db");
process.env.DATABASE_URL = url;

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { createDemoAccounts } = await import("@/lib/services/users");
  await createDemoAccounts({ kind: "system", what: "demo" });
  const { loadDemoIfEmpty } = await import("@/lib/services/demo");
  expect(await loadDemoIfEmpty()).toBe("loaded");
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

async function storedInputs() {
  const { demoSizingQuery } = await import("@/lib/services/demo");
  const { getDefinition, listLatestDefinitions } = await import("@/lib/db/definitions");
  const { profileSchema, profileSeries } = await import("@/lib/design/profile");
  const { packSchema, productSchema } = await import("@/lib/thermal/definitions");
  const { limitSetSchema } = await import("@/lib/exposure/limits");
  const q = (await demoSizingQuery())!;
  expect(q).not.toBeNull();
  const body = async (id: string) => (await getDefinition(id))!.body;
  const plan = (await listLatestDefinitions("limits")).find((d) => d.name === "Harrowgate chilled ready meals (example plan)")!;
  return {
    series: profileSeries(profileSchema.parse(await body(q.source.replace(/^profile:/, "")))),
    product: productSchema.parse(await body(q.product)),
    pack: packSchema.parse(await body(q.pack)),
    limits: limitSetSchema.parse(await body(q.limits)),
    plan: limitSetSchema.parse(plan.body),
  };
}

describe("the demo sizes out of the box", () => {
  it("demoSizingQuery's stored inputs give a feasible EPS wall on the 0.1 mm grid", async () => {
    const { size } = await import("@/lib/design/sizing");
    const { parseVariable } = await import("@/lib/design/vary");
    const d = await storedInputs();
    const r = size({ ...d, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.15 });
    expect(r.feasible).toBe(true);
    expect(r.rule_notes).toEqual([]);
    expect(Number.isInteger(Math.round(r.value! * 1e4)) && Math.abs(r.value! * 1e4 - Math.round(r.value! * 1e4)) < 1e-6).toBe(true);
    expect(r.value!).toBeGreaterThan(0.025); // the stored tote's 25 mm is too thin for the summer route
  });

  it("the full example plan cannot size: its air rule is named before the search and at the best end", async () => {
    const { size } = await import("@/lib/design/sizing");
    const { parseVariable } = await import("@/lib/design/vary");
    const d = await storedInputs();
    const r = size({ ...d, limits: d.plan, variable: parseVariable("layer:1:thickness_m")!, min: 0.001, max: 0.15 });
    expect(r.feasible).toBe(false);
    expect(r.rule_notes.map((n) => [n.id, n.kind])).toEqual([["air-above-8C", "independent"]]);
    expect(r.governing.map((g) => g.id)).toEqual(["air-above-8C"]);
  });
});
