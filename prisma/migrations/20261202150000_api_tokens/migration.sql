-- CreateTable
CREATE TABLE "ApiToken" (
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
    CONSTRAINT "ApiToken_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateIndex
CREATE UNIQUE INDEX "ApiToken_tokenSha256_key" ON "ApiToken"("tokenSha256");

-- CreateIndex
CREATE INDEX "ApiToken_userId_idx" ON "ApiToken"("userId");


-- A token's identity, owner, scope and expiry never change, and a revocation is final: only lastUsedAt
-- moves, and revokedAt is set once. Tokens are never deleted, so audit entries that name one keep their meaning.
CREATE TRIGGER "ApiToken_fixed" BEFORE UPDATE ON "ApiToken"
WHEN NEW."id" IS NOT OLD."id" OR NEW."name" IS NOT OLD."name" OR NEW."userId" IS NOT OLD."userId" OR NEW."scope" IS NOT OLD."scope"
  OR NEW."prefix" IS NOT OLD."prefix" OR NEW."tokenSha256" IS NOT OLD."tokenSha256" OR NEW."createdAt" IS NOT OLD."createdAt"
  OR NEW."expiresAt" IS NOT OLD."expiresAt" OR (OLD."revokedAt" IS NOT NULL AND NEW."revokedAt" IS NOT OLD."revokedAt")
BEGIN SELECT RAISE(ABORT, 'an API token''s name, owner, scope and expiry cannot change, and a revocation is final'); END;
CREATE TRIGGER "ApiToken_no_delete" BEFORE DELETE ON "ApiToken" BEGIN SELECT RAISE(ABORT, 'an API token is revoked, never deleted'); END;
