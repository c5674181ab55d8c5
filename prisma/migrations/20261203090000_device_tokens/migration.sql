-- Device tokens become API tokens (scope "device") bound to one monitor by the new column "monitorId".

-- The table is redefined (SQLite cannot add a foreign key in place), which drops its triggers: drop them
-- first, and create them again below with "monitorId" among the fields that never change.
DROP TRIGGER IF EXISTS "ApiToken_fixed";
DROP TRIGGER IF EXISTS "ApiToken_no_delete";

-- RedefineTables
PRAGMA defer_foreign_keys=ON;
PRAGMA foreign_keys=OFF;
CREATE TABLE "new_ApiToken" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "userId" TEXT NOT NULL,
    "scope" TEXT NOT NULL,
    "prefix" TEXT NOT NULL,
    "tokenSha256" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" DATETIME,
    "revokedAt" DATETIME,
    "lastUsedAt" DATETIME,
    "monitorId" TEXT,
    CONSTRAINT "ApiToken_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "ApiToken_monitorId_fkey" FOREIGN KEY ("monitorId") REFERENCES "Monitor" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);
INSERT INTO "new_ApiToken" ("createdAt", "expiresAt", "id", "lastUsedAt", "name", "prefix", "revokedAt", "scope", "tokenSha256", "userId") SELECT "createdAt", "expiresAt", "id", "lastUsedAt", "name", "prefix", "revokedAt", "scope", "tokenSha256", "userId" FROM "ApiToken";
DROP TABLE "ApiToken";
ALTER TABLE "new_ApiToken" RENAME TO "ApiToken";
CREATE UNIQUE INDEX "ApiToken_tokenSha256_key" ON "ApiToken"("tokenSha256");
CREATE INDEX "ApiToken_userId_idx" ON "ApiToken"("userId");
CREATE INDEX "ApiToken_monitorId_idx" ON "ApiToken"("monitorId");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;

-- Monitors made before this migration keep their device token: its SHA-256 becomes a device token bound to the
-- monitor, so it keeps working, shows in the token list and can be revoked. A token needs an owner; the monitor
-- did not record who made it, so the owner is the first administrator (the oldest enabled admin account). In a
-- database with no administrator nothing is migrated and those monitors' old tokens are refused (401): an
-- administrator issues a new one with `corelag token create --scope device --monitor ID`.
-- (PostgreSQL: prisma/postgres/manual/20261203090000_device_tokens.sql)
INSERT INTO "ApiToken" ("id", "name", "userId", "scope", "prefix", "tokenSha256", "createdAt", "monitorId")
SELECT lower(hex(randomblob(16))), substr('device: ' || m."name", 1, 120), a."id", 'device', 'cmd_', m."deviceTokenSha256", m."createdAt", m."id"
FROM "Monitor" m
JOIN (SELECT "id" FROM "User" WHERE "role" = 'admin' AND "disabled" = 0 ORDER BY "createdAt", "id" LIMIT 1) a
WHERE NOT EXISTS (SELECT 1 FROM "ApiToken" t WHERE t."tokenSha256" = m."deviceTokenSha256");

-- A token's identity, owner, scope, monitor and expiry never change, and a revocation is final: only lastUsedAt
-- moves, and revokedAt is set once. Tokens are never deleted, so audit entries that name one keep their meaning.
CREATE TRIGGER "ApiToken_fixed" BEFORE UPDATE ON "ApiToken"
WHEN NEW."id" IS NOT OLD."id" OR NEW."name" IS NOT OLD."name" OR NEW."userId" IS NOT OLD."userId" OR NEW."scope" IS NOT OLD."scope"
  OR NEW."prefix" IS NOT OLD."prefix" OR NEW."tokenSha256" IS NOT OLD."tokenSha256" OR NEW."createdAt" IS NOT OLD."createdAt"
  OR NEW."expiresAt" IS NOT OLD."expiresAt" OR NEW."monitorId" IS NOT OLD."monitorId" OR (OLD."revokedAt" IS NOT NULL AND NEW."revokedAt" IS NOT OLD."revokedAt")
BEGIN SELECT RAISE(ABORT, 'an API token''s name, owner, scope, monitor and expiry cannot change, and a revocation is final'); END;
CREATE TRIGGER "ApiToken_no_delete" BEFORE DELETE ON "ApiToken" BEGIN SELECT RAISE(ABORT, 'an API token is revoked, never deleted'); END;
