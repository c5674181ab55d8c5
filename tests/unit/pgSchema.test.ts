import { describe, expect, it } from "vitest";
import { postgresCondition, postgresSchema, postgresTrigger, sqliteTriggers } from "../../scripts/pgSchema";

// The translation of SQLite refusal triggers into PostgreSQL, on the exact forms the migrations use
// (prisma/migrations/20261201020000_audit_signoff and 20261202070000_records_under_chain).
describe("restating SQLite triggers for PostgreSQL", () => {
  it("reads a refusal trigger with and without WHEN, unescaping the message", () => {
    const sql = `-- a comment; with a semicolon
CREATE TRIGGER "A_no_delete" BEFORE DELETE ON "A" BEGIN SELECT RAISE(ABORT, 'kept; always'); END;
CREATE TRIGGER "R_final" BEFORE UPDATE ON "R"
WHEN NEW."x" IS NOT OLD."x" OR NEW."t" IS OLD."t"
BEGIN SELECT RAISE(ABORT, 'a review''s result is final'); END;
CREATE INDEX "i" ON "A"("x");`;
    const r = sqliteTriggers(sql);
    expect(r.triggers).toEqual([
      { name: "A_no_delete", timing: "BEFORE", event: "DELETE", table: "A", when: null, message: "kept; always" },
      { name: "R_final", timing: "BEFORE", event: "UPDATE", table: "R", when: `NEW."x" IS NOT OLD."x" OR NEW."t" IS OLD."t"`, message: "a review's result is final" },
    ]);
    expect(r.rest.trim()).toBe(`CREATE INDEX "i" ON "A"("x");`);
  });

  it("writes SQLite's null-safe IS / IS NOT as IS NOT DISTINCT FROM / IS DISTINCT FROM, and leaves IS [NOT] NULL", () => {
    expect(postgresCondition(`NEW."a" IS NOT OLD."a" AND NEW."b" IS OLD."b" AND NEW."c" IS NULL AND NEW."d" IS NOT NULL`)).toBe(
      `NEW."a" IS DISTINCT FROM OLD."a" AND NEW."b" IS NOT DISTINCT FROM OLD."b" AND NEW."c" IS NULL AND NEW."d" IS NOT NULL`,
    );
  });

  it("emits a row trigger calling corelag_refuse with the message, replacing an earlier one of the same name", () => {
    expect(postgresTrigger({ name: "R_final", timing: "BEFORE", event: "UPDATE", table: "R", when: `OLD."s" = 'signed'`, message: "it's final" })).toBe(
      `DROP TRIGGER IF EXISTS "R_final" ON "R";\nCREATE TRIGGER "R_final" BEFORE UPDATE ON "R" FOR EACH ROW\nWHEN (OLD."s" = 'signed')\nEXECUTE FUNCTION corelag_refuse('it''s final');`,
    );
  });

  it("swaps the schema's provider and client folder, and refuses a schema it cannot swap", () => {
    const s = postgresSchema(`generator client {\n  provider = "prisma-client"\n  output   = "../generated/prisma"\n}\ndatasource db {\n  provider = "sqlite"\n  url      = "file:./x.db"\n}\n`);
    expect(s).toContain('provider = "postgresql"');
    expect(s).toContain('output   = "../../generated/prisma-pg"');
    expect(s).not.toContain("file:");
    expect(() => postgresSchema(`datasource db {\n  provider = "mysql"\n}`)).toThrow(/cannot find/);
  });
});
