import { describe, expect, it } from "vitest";
import { allows, PERMISSIONS, rolesAllowing, scopeAllows } from "../../lib/access/roles";
import { actorAllows, actorLabel, actorRecord, type Actor } from "../../lib/access/actor";

// The role table of issue 13, "Accounts and roles", checked permission by permission (the expected sets
// are written from the words, not from the code).
describe("roles", () => {
  it("admin may do everything", () => {
    for (const p of PERMISSIONS) expect(allows("admin", p), p).toBe(true);
  });
  it("reviewer imports, edits definitions, runs and signs reviews; no user administration, no design studies", () => {
    expect(PERMISSIONS.filter((p) => !allows("reviewer", p))).toEqual(["design:run", "user:admin"]);
  });
  it("designer edits definitions and runs design studies; cannot sign off or import", () => {
    expect(PERMISSIONS.filter((p) => allows("designer", p))).toEqual(["read", "definition:edit", "design:run"]);
  });
  it("auditor only reads", () => {
    expect(PERMISSIONS.filter((p) => allows("auditor", p))).toEqual(["read"]);
  });
  it("only reviewers and admins may sign", () => {
    expect(rolesAllowing("review:sign")).toEqual(["admin", "reviewer"]);
  });
  it("a token acts with its owner's role narrowed by its scope", () => {
    const token = (scope: "read" | "write" | "device"): Actor => ({ kind: "token", tokenId: "t", tokenName: "gw", scope, userId: "u", name: "Ada", role: "reviewer" });
    expect(actorAllows(token("read"), "read")).toBe(true);
    expect(actorAllows(token("read"), "trace:import")).toBe(false);
    expect(actorAllows(token("write"), "trace:import")).toBe(true);
    expect(actorAllows(token("write"), "user:admin")).toBe(false);
    expect(scopeAllows("device", "monitor:post-readings")).toBe(true);
    expect(scopeAllows("device", "read")).toBe(false);
  });
  it("writes the actor of an audit entry as a label and a record", () => {
    const u: Actor = { kind: "user", userId: "u1", name: "Ada Reviewer", email: "ada@example.com", role: "reviewer" };
    expect(actorLabel(u)).toBe("Ada Reviewer <ada@example.com>");
    expect(actorRecord(u)).toEqual({ kind: "user", user_id: "u1", name: "Ada Reviewer" });
    expect(actorLabel({ kind: "cli", osUser: "ops" })).toBe("cli:ops");
  });
});
