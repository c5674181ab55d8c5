-- CreateTable
CREATE TABLE "Monitor" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "productId" TEXT NOT NULL,
    "packId" TEXT,
    "limitsId" TEXT NOT NULL,
    "shipmentId" TEXT,
    "serial" TEXT,
    "model" TEXT NOT NULL DEFAULT 'auto',
    "alertLeadMin" REAL NOT NULL,
    "airHold" TEXT NOT NULL DEFAULT 'current',
    "airHoldCount" INTEGER,
    "webhooks" JSONB NOT NULL,
    "emails" JSONB NOT NULL,
    "webhookSecret" TEXT NOT NULL,
    "deviceTokenSha256" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'open',
    "closedAt" DATETIME,
    "traceId" TEXT,
    "reviewId" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "MonitorBatch" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "monitorId" TEXT NOT NULL,
    "sha256" TEXT NOT NULL,
    "format" TEXT NOT NULL,
    "accepted" INTEGER NOT NULL,
    "duplicates" INTEGER NOT NULL,
    "conflicts" INTEGER NOT NULL,
    "refused" INTEGER NOT NULL,
    "receivedAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "MonitorBatch_monitorId_fkey" FOREIGN KEY ("monitorId") REFERENCES "Monitor" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "MonitorReading" (
    "monitorId" TEXT NOT NULL,
    "tS" REAL NOT NULL,
    "airC" REAL NOT NULL,
    "probeC" REAL,
    "batchId" TEXT NOT NULL,

    PRIMARY KEY ("monitorId", "tS"),
    CONSTRAINT "MonitorReading_monitorId_fkey" FOREIGN KEY ("monitorId") REFERENCES "Monitor" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "MonitorReading_batchId_fkey" FOREIGN KEY ("batchId") REFERENCES "MonitorBatch" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Alert" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "monitorId" TEXT NOT NULL,
    "key" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "rule" TEXT,
    "message" TEXT NOT NULL,
    "raisedAt" DATETIME NOT NULL,
    "clearedAt" DATETIME,
    CONSTRAINT "Alert_monitorId_fkey" FOREIGN KEY ("monitorId") REFERENCES "Monitor" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "AlertDelivery" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "alertId" TEXT NOT NULL,
    "event" TEXT NOT NULL,
    "channel" TEXT NOT NULL,
    "target" TEXT NOT NULL,
    "attempt" INTEGER NOT NULL,
    "at" DATETIME NOT NULL,
    "ok" BOOLEAN NOT NULL,
    "httpStatus" INTEGER,
    "error" TEXT,
    "nextAt" DATETIME,
    CONSTRAINT "AlertDelivery_alertId_fkey" FOREIGN KEY ("alertId") REFERENCES "Alert" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateIndex
CREATE INDEX "Monitor_status_createdAt_idx" ON "Monitor"("status", "createdAt");

-- CreateIndex
CREATE INDEX "MonitorBatch_monitorId_receivedAt_idx" ON "MonitorBatch"("monitorId", "receivedAt");

-- CreateIndex
CREATE INDEX "Alert_monitorId_clearedAt_idx" ON "Alert"("monitorId", "clearedAt");

-- CreateIndex
CREATE INDEX "AlertDelivery_alertId_at_idx" ON "AlertDelivery"("alertId", "at");


-- Readings and their batches are what a monitor received: never changed or deleted. Delivery attempts are a log.
CREATE TRIGGER "MonitorReading_no_update" BEFORE UPDATE ON "MonitorReading" BEGIN SELECT RAISE(ABORT, 'a stored reading cannot be changed'); END;
CREATE TRIGGER "MonitorReading_no_delete" BEFORE DELETE ON "MonitorReading" BEGIN SELECT RAISE(ABORT, 'a stored reading cannot be deleted'); END;
CREATE TRIGGER "MonitorBatch_no_update" BEFORE UPDATE ON "MonitorBatch" BEGIN SELECT RAISE(ABORT, 'a stored batch cannot be changed'); END;
CREATE TRIGGER "MonitorBatch_no_delete" BEFORE DELETE ON "MonitorBatch" BEGIN SELECT RAISE(ABORT, 'a stored batch cannot be deleted'); END;
CREATE TRIGGER "AlertDelivery_no_update" BEFORE UPDATE ON "AlertDelivery" BEGIN SELECT RAISE(ABORT, 'a delivery attempt cannot be changed'); END;
CREATE TRIGGER "AlertDelivery_no_delete" BEFORE DELETE ON "AlertDelivery" BEGIN SELECT RAISE(ABORT, 'a delivery attempt cannot be deleted'); END;
-- An alert changes once: cleared (its time set once); a monitor is never deleted.
CREATE TRIGGER "Alert_cleared_once" BEFORE UPDATE ON "Alert" WHEN OLD."clearedAt" IS NOT NULL OR NEW."key" IS NOT OLD."key" OR NEW."message" IS NOT OLD."message" OR NEW."raisedAt" IS NOT OLD."raisedAt" OR NEW."monitorId" IS NOT OLD."monitorId" BEGIN SELECT RAISE(ABORT, 'an alert is only cleared, once'); END;
CREATE TRIGGER "Alert_no_delete" BEFORE DELETE ON "Alert" BEGIN SELECT RAISE(ABORT, 'an alert cannot be deleted'); END;
CREATE TRIGGER "Monitor_no_delete" BEFORE DELETE ON "Monitor" BEGIN SELECT RAISE(ABORT, 'a monitor cannot be deleted: close it'); END;
