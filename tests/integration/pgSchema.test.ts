import { describe, expect, it } from "vitest";
import { driftOf, generatePostgres } from "../../scripts/pgSchema";

// The PostgreSQL schema and migrations are generated from the one source (prisma/schema.prisma and the SQLite
// migrations). Anyone adding a migration runs `npm run db:pg`; this fails, naming the files, when they forgot.
describe("the generated PostgreSQL schema and migrations", () => {
  it("are what `npm run db:pg` writes from the current source (no drift)", () => {
    const files = generatePostgres();
    expect(driftOf(files)).toEqual([]);
    // every SQLite migration has its PostgreSQL counterpart, and the refusal triggers are restated
    const all = [...files.values()].join("\n");
    for (const t of ["AuditEntry_no_update", "AuditEntry_no_delete", "AuditSignature_no_update", "Trace_no_update", "Definition_no_delete", "Review_signed_final", "Review_no_delete", "Review_stored_result_final", "Review_status_transition"]) {
      expect(all).toContain(`CREATE TRIGGER "${t}"`);
    }
  }, 180_000);
});
