-- Records under the chain (issue 12): signatures of audit entries, the meaning of a sign-off, and
-- triggers that refuse every change the application never makes. The trigger conditions are written
-- so the same rules can be restated for a second database (see DEVELOPERS.md, "Records").

-- AlterTable
ALTER TABLE "Review" ADD COLUMN "signMeaning" TEXT;

-- CreateTable
CREATE TABLE "AuditSignature" (
    "seq" INTEGER NOT NULL PRIMARY KEY,
    "keyFingerprint" TEXT NOT NULL,
    "signature" TEXT NOT NULL
);

-- Signatures are written once, with their entry.
CREATE TRIGGER "AuditSignature_no_update" BEFORE UPDATE ON "AuditSignature" BEGIN SELECT RAISE(ABORT, 'audit signatures are append-only'); END;
CREATE TRIGGER "AuditSignature_no_delete" BEFORE DELETE ON "AuditSignature" BEGIN SELECT RAISE(ABORT, 'audit signatures are append-only'); END;

-- A trace is the file as uploaded; a definition version is never edited (an edit is a new version).
CREATE TRIGGER "Trace_no_update" BEFORE UPDATE ON "Trace" BEGIN SELECT RAISE(ABORT, 'a stored trace cannot be changed'); END;
CREATE TRIGGER "Trace_no_delete" BEFORE DELETE ON "Trace" BEGIN SELECT RAISE(ABORT, 'a stored trace cannot be deleted'); END;
CREATE TRIGGER "Definition_no_update" BEFORE UPDATE ON "Definition" BEGIN SELECT RAISE(ABORT, 'a definition version cannot be changed: an edit is a new version'); END;
CREATE TRIGGER "Definition_no_delete" BEFORE DELETE ON "Definition" BEGIN SELECT RAISE(ABORT, 'a definition version cannot be deleted'); END;

-- A review allows two changes only: an open review's title, and open → signed once (with the decision,
-- signer and time). Everything the engine stored stays as it was. ("Review_signed_final" and
-- "Review_no_delete" from 20261201020000 stay in force.)
CREATE TRIGGER "Review_stored_result_final" BEFORE UPDATE ON "Review"
WHEN NEW."id" IS NOT OLD."id" OR NEW."traceId" IS NOT OLD."traceId" OR NEW."productId" IS NOT OLD."productId"
  OR NEW."packId" IS NOT OLD."packId" OR NEW."limitsId" IS NOT OLD."limitsId" OR NEW."options" IS NOT OLD."options"
  OR NEW."engineVersion" IS NOT OLD."engineVersion" OR NEW."result" IS NOT OLD."result" OR NEW."coreC" IS NOT OLD."coreC"
  OR NEW."surfaceC" IS NOT OLD."surfaceC" OR NEW."meanC" IS NOT OLD."meanC" OR NEW."coolantC" IS NOT OLD."coolantC"
  OR NEW."resultSha256" IS NOT OLD."resultSha256" OR NEW."outcome" IS NOT OLD."outcome" OR NEW."correctsId" IS NOT OLD."correctsId"
  OR NEW."createdAt" IS NOT OLD."createdAt"
BEGIN SELECT RAISE(ABORT, 'a review''s stored inputs and result cannot be changed: run a new review'); END;

CREATE TRIGGER "Review_status_transition" BEFORE UPDATE ON "Review"
WHEN NOT (
  (NEW."status" = 'open' AND NEW."signedBy" IS NULL AND NEW."signedAt" IS NULL AND NEW."decision" IS NULL AND NEW."signComment" IS NULL AND NEW."signMeaning" IS NULL)
  OR (NEW."status" = 'signed' AND OLD."status" = 'open' AND NEW."title" IS OLD."title"
      AND NEW."signedBy" IS NOT NULL AND NEW."signedAt" IS NOT NULL AND NEW."decision" IN ('accept', 'hold', 'reject'))
)
BEGIN SELECT RAISE(ABORT, 'a review only changes from open to signed, once, with a decision, a signer and a time'); END;
