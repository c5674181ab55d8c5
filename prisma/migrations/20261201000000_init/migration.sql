-- CreateTable
CREATE TABLE "Trace" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "sha256" TEXT NOT NULL,
    "original" BLOB NOT NULL,
    "importSettings" JSONB NOT NULL,
    "timesS" BLOB NOT NULL,
    "airC" BLOB NOT NULL,
    "sampleCount" INTEGER NOT NULL,
    "startAt" DATETIME NOT NULL,
    "endAt" DATETIME NOT NULL,
    "warnings" JSONB NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Definition" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "kind" TEXT NOT NULL,
    "lineage" TEXT NOT NULL,
    "version" INTEGER NOT NULL,
    "name" TEXT NOT NULL,
    "body" JSONB NOT NULL,
    "sha256" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Review" (
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
    "resultSha256" TEXT NOT NULL,
    "outcome" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Review_traceId_fkey" FOREIGN KEY ("traceId") REFERENCES "Trace" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Review_productId_fkey" FOREIGN KEY ("productId") REFERENCES "Definition" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Review_packId_fkey" FOREIGN KEY ("packId") REFERENCES "Definition" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Review_limitsId_fkey" FOREIGN KEY ("limitsId") REFERENCES "Definition" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateIndex
CREATE INDEX "Definition_kind_name_idx" ON "Definition"("kind", "name");

-- CreateIndex
CREATE UNIQUE INDEX "Definition_lineage_version_key" ON "Definition"("lineage", "version");

