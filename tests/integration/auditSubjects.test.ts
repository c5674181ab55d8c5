import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";

// The audit page names what each entry is about. Account entries (created, signed in, refused) and API
// token entries were shown as "not found" because only traces, definitions, reviews and shipment records
// were looked up; a refused sign-in for an address no account has is recorded under that address.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-audit-subjects-"));
const url = testDatabaseUrl(dir, "subjects.db");
process.env.DATABASE_URL = url;

let userId = "";

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { createUser, logSessionEvent } = await import("@/lib/db/users");
  // invented account; the hash is never checked here
  const made = await createUser({ email: "mira.holt@example.test", name: "Mira Holt", role: "reviewer", passwordHash: "x" }, TEST_ACTOR);
  if (!made.ok) throw new Error(made.message);
  userId = made.user.id;
  const signInSystem = { kind: "system", what: "sign-in" } as const;
  await logSessionEvent("sign-in", userId, { kind: "user", userId, name: "Mira Holt", email: "mira.holt@example.test", role: "reviewer" }, { address: "127.0.0.1" });
  await logSessionEvent("sign-in-refused", userId, signInSystem, { email: "mira.holt@example.test", address: "127.0.0.1", reason: "wrong-password" });
  await logSessionEvent("sign-in-refused", "nobody@example.test", signInSystem, { email: "nobody@example.test", address: "127.0.0.1", reason: "unknown-email" });
  // a signature refused for a wrong password (the action the audit filter did not offer)
  await logSessionEvent("signature-refused", userId, signInSystem, { email: "mira.holt@example.test", reason: "wrong-password" });
  const { createApiToken } = await import("@/lib/db/apiTokens");
  await createApiToken({ userId, name: "warehouse gateway", scope: "read", prefix: "clg_abcdefgh", tokenSha256: "0".repeat(64), expiresAt: null }, TEST_ACTOR);
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("audit subjects of accounts and tokens", () => {
  it("queryAudit names the account of a sign-in, a refused sign-in and its creation, with the users page as link", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const rows = (await queryAudit()).rows;
    const of = (action: string, entityId: string) => rows.find((r) => r.action === action && r.entityId === entityId)!;
    const account = { name: "Mira Holt <mira.holt@example.test>", href: "/users" };
    expect(of("create", userId).subject).toEqual(account);
    expect(of("sign-in", userId).subject).toEqual(account);
    expect(of("sign-in-refused", userId).subject).toEqual(account);
  });

  it("queryAudit says a refused sign-in's address belongs to no account, instead of 'not found'", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const row = (await queryAudit()).rows.find((r) => r.action === "sign-in-refused" && r.entityId === "nobody@example.test")!;
    expect(row.subject).toEqual({ name: "nobody@example.test (no account has this address)", href: null });
  });

  it("queryAudit names an API token by its name and prefix", async () => {
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const row = (await queryAudit()).rows.find((r) => r.entity === "token")!;
    expect(row.subject).toEqual({ name: "warehouse gateway (clg_abcdefgh…)", href: "/tokens" });
  });
});

// The walkthrough found the audit filters short: "Kind" offered 7 of the 16 kinds the log holds, "Action" lacked
// signature-refused, and an unknown ?action= or ?kind= was dropped, so the page showed every entry as if it matched.
describe("audit filters from the address bar", () => {
  it("AUDIT_ENTITIES and AUDIT_ACTIONS offer every kind and action the walkthrough found missing", async () => {
    const { AUDIT_ENTITIES, AUDIT_ACTIONS } = await import("@/lib/db/auditQueries");
    for (const k of ["monitor", "alert", "delivery", "shipment", "lane", "logger", "shipmentLogger", "shipmentReview", "chain"]) expect(AUDIT_ENTITIES).toContain(k);
    for (const a of ["signature-refused", "resume", "readings", "raise", "clear", "deliver", "close", "revoke", "cancel", "seal"]) expect(AUDIT_ACTIONS).toContain(a);
  });

  it("parseAuditParams keeps ?action=signature-refused, and queryAudit then finds only that entry", async () => {
    const { parseAuditParams, auditFilter } = await import("@/app/audit/filters");
    const { queryAudit } = await import("@/lib/db/auditQueries");
    const p = parseAuditParams({ action: "signature-refused" });
    expect(p.action).toBe("signature-refused");
    expect(p.unknown).toEqual([]);
    const rows = (await queryAudit(auditFilter(p, "UTC"))).rows;
    expect(rows.map((r) => [r.action, r.entityId])).toEqual([["signature-refused", userId]]);
  });

  it("parseAuditParams reports an unknown action and kind by their values instead of dropping them", async () => {
    const { parseAuditParams, unknownFilterMessage } = await import("@/app/audit/filters");
    const p = parseAuditParams({ action: "sign-off", entity: "shipments", q: "mira" });
    expect(p.action).toBeUndefined();
    expect(p.entity).toBeUndefined();
    expect(p.unknown).toEqual([{ field: "entity", value: "shipments" }, { field: "action", value: "sign-off" }]);
    expect(unknownFilterMessage(p.unknown)).toBe("No entries shown: the log has no kind of record “shipments” and no action “sign-off”. Choose from the lists (“any” shows every entry).");
    expect(parseAuditParams({ entity: "shipmentLogger" })).toMatchObject({ entity: "shipmentLogger", unknown: [] });
    // "kind", the filter label's word, is read as entity, so a typed ?kind= filters or is reported too
    expect(parseAuditParams({ kind: "monitor" })).toMatchObject({ entity: "monitor", unknown: [] });
    expect(parseAuditParams({ kind: "monitors" }).unknown).toEqual([{ field: "entity", value: "monitors" }]);
  });
});
