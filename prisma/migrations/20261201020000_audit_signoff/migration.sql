-- CreateTable
CREATE TABLE "AuditEntry" (
    "seq" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "at" DATETIME NOT NULL,
    "action" TEXT NOT NULL,
    "entity" TEXT NOT NULL,
    "entityId" TEXT NOT NULL,
    "actor" TEXT NOT NULL,
    "details" JSONB NOT NULL,
    "prevHash" TEXT NOT NULL,
    "hash" TEXT NOT NULL
);

-- RedefineTables
PRAGMA defer_foreign_keys=ON;
PRAGMA foreign_keys=OFF;
CREATE TABLE "new_Review" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "title" TEXT NOT NULL,
    "traceId" TEXT NOT NULL,
    "productId" TEXT NOT NULL,
    "packId" TEXT,
    "limitsId" TEXT NOT NULL,
    "options" JSONB NOT NULL,
    "engineVersion" TEXT NOT NULL,
    "result" JSONB NOT NULL,
    "coreC" BLOB NOT NULL,
    "surfaceC" BLOB,
    "meanC" BLOB,
    "coolantC" BLOB,
    "resultSha256" TEXT NOT NULL,
    "outcome" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'open',
    "signedBy" TEXT,
    "signedAt" DATETIME,
    "decision" TEXT,
    "signComment" TEXT,
    "correctsId" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Review_traceId_fkey" FOREIGN KEY ("traceId") REFERENCES "Trace" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Review_productId_fkey" FOREIGN KEY ("productId") REFERENCES "Definition" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Review_packId_fkey" FOREIGN KEY ("packId") REFERENCES "Definition" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Review_limitsId_fkey" FOREIGN KEY ("limitsId") REFERENCES "Definition" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Review_correctsId_fkey" FOREIGN KEY ("correctsId") REFERENCES "Review" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);
INSERT INTO "new_Review" ("coolantC", "coreC", "createdAt", "engineVersion", "id", "limitsId", "meanC", "options", "outcome", "packId", "productId", "result", "resultSha256", "surfaceC", "title", "traceId") SELECT "coolantC", "coreC", "createdAt", "engineVersion", "id", "limitsId", "meanC", "options", "outcome", "packId", "productId", "result", "resultSha256", "surfaceC", "title", "traceId" FROM "Review";
DROP TABLE "Review";
ALTER TABLE "new_Review" RENAME TO "Review";
CREATE INDEX "Review_createdAt_idx" ON "Review"("createdAt");
CREATE INDEX "Review_outcome_status_idx" ON "Review"("outcome", "status");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;

-- CreateIndex
CREATE UNIQUE INDEX "AuditEntry_hash_key" ON "AuditEntry"("hash");


-- The audit log is append-only, and a signed review is final.
CREATE TRIGGER "AuditEntry_no_update" BEFORE UPDATE ON "AuditEntry" BEGIN SELECT RAISE(ABORT, 'the audit log is append-only'); END;
CREATE TRIGGER "AuditEntry_no_delete" BEFORE DELETE ON "AuditEntry" BEGIN SELECT RAISE(ABORT, 'the audit log is append-only'); END;
CREATE TRIGGER "Review_signed_final" BEFORE UPDATE ON "Review" WHEN OLD."status" = 'signed' BEGIN SELECT RAISE(ABORT, 'a signed review cannot be edited'); END;
CREATE TRIGGER "Review_no_delete" BEFORE DELETE ON "Review" BEGIN SELECT RAISE(ABORT, 'reviews are kept: a correction is a new review'); END;
