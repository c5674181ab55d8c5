import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";
import type { Actor } from "../../lib/access/actor";

// Electronic signatures on a real database (issue 13): the password re-entered at signing, the
// second-person rule of a limit set, and who may sign at all. The users are made with the real hashing.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-sig-"));
const url = testDatabaseUrl(dir, "sig.db");
process.env.DATABASE_URL = url;
const DEMO = path.join(__dirname, "../../public/demo");
const PASSWORD_A = "alpha-password-123";
const PASSWORD_B = "bravo-password-456";
let ada: Actor;
let ben: Actor;
let reviewId = "";

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const users = await import("@/lib/services/users");
  const a = await users.addUser({ email: "ada@example.com", name: "Ada Reviewer", role: "reviewer", password: PASSWORD_A }, TEST_ACTOR);
  const b = await users.addUser({ email: "ben@example.com", name: "Ben Reviewer", role: "reviewer", password: PASSWORD_B }, TEST_ACTOR);
  if (!a.ok || !b.ok) throw new Error("users not created");
  ada = { kind: "user", userId: a.user.id, name: a.user.name, email: a.user.email, role: "reviewer" };
  ben = { kind: "user", userId: b.user.id, name: b.user.name, email: b.user.email, role: "reviewer" };
  const dbm = await import("@/lib/db");
  const { importCsv } = await import("@/lib/trace");
  const { runAndStoreReview } = await import("@/lib/services/reviews");
  const bytes = readFileSync(path.join(DEMO, "route7-tote3.csv"));
  const traceId = await dbm.createTrace({ name: "sig", fileName: "route7-tote3.csv", bytes, imported: importCsv(bytes), actor: ada });
  const p = await dbm.createDefinition("product", JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")), ada);
  const limits = { ...JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")), second_person_review: true };
  const l = await dbm.createDefinition("limits", limits, ada);
  const res = await runAndStoreReview({ title: "second person", traceId, productId: p.id, limitsId: l.id }, ada);
  if (!res.ok) throw new Error(res.message);
  reviewId = res.reviewId;
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("signing a review", () => {
  it("refuses a token or a script: a signature needs a person and a password", async () => {
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    const token: Actor = { kind: "token", tokenId: "t1", tokenName: "gateway", scope: "write", userId: ben.kind === "user" ? ben.userId : "", name: "Ben Reviewer", role: "reviewer" };
    expect(await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: PASSWORD_B }, token)).toMatchObject({ ok: false, reason: "not-a-user" });
    expect(await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: PASSWORD_B }, TEST_ACTOR)).toMatchObject({ ok: false, reason: "not-a-user" });
  });

  it("refuses a wrong password, and another user's password", async () => {
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    expect(await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: "wrong-password-0" }, ben)).toMatchObject({ ok: false, reason: "password", field: "password" });
    expect(await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: PASSWORD_A }, ben)).toMatchObject({ ok: false, reason: "password" });
  });

  it("second-person review: the user who ran the review cannot sign it, even with the right password", async () => {
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    const r = await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: PASSWORD_A }, ada);
    expect(r).toMatchObject({ ok: false, reason: "second-person" });
    const { getReview } = await import("@/lib/db/reviews");
    expect((await getReview(reviewId))!.status).toBe("open");
  });

  it("a decision that differs from the suggestion without a comment is refused before the password is checked, so it uses up no attempt toward the lockout", async () => {
    const users = await import("@/lib/services/users");
    const made = await users.addUser({ email: "dee@example.com", name: "Dee Reviewer", role: "reviewer", password: "echo-password-567" }, TEST_ACTOR);
    if (!made.ok) throw new Error("user not created");
    const dee: Actor = { kind: "user", userId: made.user.id, name: made.user.name, email: made.user.email, role: "reviewer" };
    const { getReview } = await import("@/lib/db/reviews");
    const suggested = (await getReview(reviewId))!.outcome;
    const other = suggested === "reject" ? "hold" : "reject";
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    const r = await signReviewWithPassword(reviewId, { decision: other, password: "a wrong password" }, dee);
    expect(r).toMatchObject({ ok: false, reason: "comment-required", field: "comment" });
    const { db } = await import("@/lib/db/client");
    expect(await db.auditEntry.count({ where: { action: "signature-refused", entityId: made.user.id } })).toBe(0);
    // with the comment, the wrong password is refused and recorded under the person who tried, naming the review
    const w = await signReviewWithPassword(reviewId, { decision: other, comment: "probe the tote first", password: "a wrong password" }, dee);
    expect(w).toMatchObject({ ok: false, reason: "password" });
    const e = (await db.auditEntry.findFirst({ where: { action: "signature-refused", entityId: made.user.id } }))!;
    expect(e.actor).toBe("Dee Reviewer <dee@example.com>");
    expect(e.details).toMatchObject({ reason: "wrong-password", signing: `review ${reviewId}` });
  });

  it("another user signs with their password: the record names them, the time and the meaning; the audit entry names their account", async () => {
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    const { getReview } = await import("@/lib/db/reviews");
    const { lastAuditEntry } = await import("@/lib/db/auditQueries");
    const outcome = (await getReview(reviewId))!.outcome as "accept" | "hold" | "reject";
    const before = Date.now();
    expect(await signReviewWithPassword(reviewId, { decision: outcome, password: PASSWORD_B }, ben)).toEqual({ ok: true });
    const signed = (await getReview(reviewId))!;
    expect(signed.status).toBe("signed");
    expect(signed.signedBy).toBe("Ben Reviewer");
    expect(signed.signedAt!.getTime()).toBeGreaterThanOrEqual(before - 1000);
    expect(signed.signMeaning).toMatch(/^(Released|Held|Rejected): I reviewed this record/);
    const entry = (await lastAuditEntry(reviewId, "sign"))!;
    expect(entry.actor).toBe("Ben Reviewer <ben@example.com>");
    expect((entry.details as { actor: { user_id: string } }).actor.user_id).toBe(ben.kind === "user" ? ben.userId : "");
    // the re-check made at signing is in the log too, before the signature
    const recheck = (await lastAuditEntry(reviewId, "verify"))!;
    expect(recheck.seq).toBeLessThan(entry.seq);
    expect((recheck.details as { reproduced: boolean }).reproduced).toBe(true);
  });

  it("wrong passwords at signing count toward the account's lockout: the fifth locks it, then even the right password cannot sign or sign in, and each refusal is audited", async () => {
    const users = await import("@/lib/services/users");
    const made = await users.addUser({ email: "cy@example.com", name: "Cy Reviewer", role: "reviewer", password: "charlie-password-789" }, TEST_ACTOR);
    if (!made.ok) throw new Error("user not created");
    const cy: Actor = { kind: "user", userId: made.user.id, name: made.user.name, email: made.user.email, role: "reviewer" };
    const { signReviewWithPassword } = await import("@/lib/services/signature");
    const { ACCOUNT_FAILURE_LIMIT, signIn } = await import("@/lib/services/access");
    expect(ACCOUNT_FAILURE_LIMIT).toBe(5); // README: five wrong passwords within 15 minutes lock the account
    const messages: string[] = [];
    for (let i = 0; i < 5; i++) {
      const r = await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: `wrong-${i}` }, cy);
      expect(r).toMatchObject({ ok: false, reason: "password", field: "password" });
      messages.push(r.ok ? "" : r.message);
    }
    expect(messages[0]).toBe("the password is wrong; nothing was signed (4 more wrong passwords lock the account for 15 minutes)");
    expect(messages[3]).toBe("the password is wrong; nothing was signed (1 more wrong password locks the account for 15 minutes)");
    expect(messages[4]).toBe("the password is wrong; nothing was signed. This account is now locked for 15 minutes");
    const right = await signReviewWithPassword(reviewId, { decision: "hold", comment: "probe it", password: "charlie-password-789" }, cy);
    expect(right).toMatchObject({ ok: false, reason: "password" });
    expect(right.ok ? "" : right.message).toMatch(/^this account is locked after 5 wrong passwords; nothing was signed\. Try again after \d\d:\d\d UTC/);
    const signedIn = await signIn({ email: "cy@example.com", password: "charlie-password-789" }, new Headers({ "x-forwarded-for": "192.0.2.7" }));
    expect(signedIn).toMatchObject({ ok: false, locked: true });
    const { db } = await import("@/lib/db/client");
    const refused = await db.auditEntry.findMany({ where: { action: "signature-refused", entityId: made.user.id }, orderBy: { seq: "asc" } });
    expect(refused.map((e) => (e.details as { reason: string }).reason)).toEqual(["wrong-password", "wrong-password", "wrong-password", "wrong-password", "wrong-password", "locked"]);
  });

  it("a new password from an administrator (or `corelag user set-password`) lifts the lockout, ends the user's sessions, replaces the old one, and is audited without it", async () => {
    const { findUser, resetPassword, passwordMatches } = await import("@/lib/services/users");
    const cy = (await findUser("cy@example.com"))!;
    const { db } = await import("@/lib/db/client");
    await db.session.create({ data: { id: "sess-cy", token: "tok-cy", userId: cy.id, expiresAt: new Date(Date.now() + 3600_000) } });
    // the same rule as a new account's password (lib/services/users.ts MIN_PASSWORD_CHARS)
    expect(await resetPassword("cy@example.com", "short", TEST_ACTOR)).toMatchObject({ ok: false, reason: "invalid", message: "at least 12 characters" });
    expect(await resetPassword("cy@example.com", "delta-password-012", TEST_ACTOR)).toMatchObject({ ok: true, user: { email: "cy@example.com" } });
    expect(await passwordMatches(cy.id, "charlie-password-789")).toBe(false);
    expect(await passwordMatches(cy.id, "delta-password-012")).toBe(true);
    expect(await db.session.count({ where: { userId: cy.id } })).toBe(0);
    // the account locked by the earlier test can sign again
    const { reauthenticate } = await import("@/lib/services/access");
    expect(await reauthenticate(cy.id, "delta-password-012")).toEqual({ ok: true });
    const entry = await db.auditEntry.findFirst({ where: { action: "set-password", entityId: cy.id } });
    expect(entry?.details).toMatchObject({ email: "cy@example.com", sessions_ended: 1 });
    expect(JSON.stringify(entry?.details)).not.toMatch(/delta-password|argon2/);
    // from a shell: the password on standard input, never on the command line
    const { spawnSync } = await import("node:child_process");
    const cli = (input: string, ...args: string[]) => spawnSync(process.execPath, [path.join(__dirname, "../../dist/cli/corelag.mjs"), "user", "set-password", ...args], { encoding: "utf8", env: { ...process.env, DATABASE_URL: url }, input });
    expect(cli("echo-password-345\n", "--email", "cy@example.com").stderr.split("\n")[0]).toMatch(/--password-stdin is required/);
    const r = cli("echo-password-345\n", "--email", "cy@example.com", "--password-stdin");
    expect(r.status, r.stderr).toBe(0);
    expect(await passwordMatches(cy.id, "echo-password-345")).toBe(true);
  });
});
