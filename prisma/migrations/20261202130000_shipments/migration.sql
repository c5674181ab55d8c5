-- CreateTable
CREATE TABLE "Lane" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "origin" TEXT NOT NULL,
    "destination" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Logger" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "serial" TEXT NOT NULL,
    "description" TEXT NOT NULL,
    "accuracyK" REAL NOT NULL,
    "lastCalibrationAt" DATETIME,
    "nextCalibrationAt" DATETIME,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Shipment" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "reference" TEXT NOT NULL,
    "laneId" TEXT,
    "carrier" TEXT,
    "vehicle" TEXT,
    "plannedDepartureAt" DATETIME,
    "plannedArrivalAt" DATETIME,
    "actualDepartureAt" DATETIME,
    "actualArrivalAt" DATETIME,
    "notes" TEXT,
    "limitsId" TEXT NOT NULL,
    "outcome" TEXT,
    "result" JSONB,
    "status" TEXT NOT NULL DEFAULT 'open',
    "signedBy" TEXT,
    "signedAt" DATETIME,
    "decision" TEXT,
    "signComment" TEXT,
    "signMeaning" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Shipment_laneId_fkey" FOREIGN KEY ("laneId") REFERENCES "Lane" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Shipment_limitsId_fkey" FOREIGN KEY ("limitsId") REFERENCES "Definition" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "ShipmentLogger" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "shipmentId" TEXT NOT NULL,
    "ordinal" INTEGER NOT NULL,
    "position" TEXT NOT NULL,
    "serial" TEXT,
    "fileNamePattern" TEXT,
    "traceId" TEXT,
    "products" JSONB NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "ShipmentLogger_shipmentId_fkey" FOREIGN KEY ("shipmentId") REFERENCES "Shipment" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "ShipmentLogger_traceId_fkey" FOREIGN KEY ("traceId") REFERENCES "Trace" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "ShipmentReview" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "shipmentId" TEXT NOT NULL,
    "shipmentLoggerId" TEXT NOT NULL,
    "productId" TEXT NOT NULL,
    "reviewId" TEXT NOT NULL,
    "runId" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "ShipmentReview_shipmentId_fkey" FOREIGN KEY ("shipmentId") REFERENCES "Shipment" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "ShipmentReview_reviewId_fkey" FOREIGN KEY ("reviewId") REFERENCES "Review" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateIndex
CREATE UNIQUE INDEX "Lane_name_key" ON "Lane"("name");

-- CreateIndex
CREATE UNIQUE INDEX "Logger_serial_key" ON "Logger"("serial");

-- CreateIndex
CREATE INDEX "Shipment_laneId_createdAt_idx" ON "Shipment"("laneId", "createdAt");

-- CreateIndex
CREATE INDEX "ShipmentLogger_shipmentId_idx" ON "ShipmentLogger"("shipmentId");

-- CreateIndex
CREATE INDEX "ShipmentReview_shipmentId_runId_idx" ON "ShipmentReview"("shipmentId", "runId");


-- A signed shipment is final: nothing about it changes. (Its logger entries are kept by the services and by
-- verify's content hashes: a trigger that looks up the shipment would need a subquery, which PostgreSQL's
-- trigger conditions do not allow.)
CREATE TRIGGER "Shipment_signed_final" BEFORE UPDATE ON "Shipment"
WHEN OLD."status" = 'signed'
BEGIN SELECT RAISE(ABORT, 'a signed shipment cannot be changed'); END;
CREATE TRIGGER "Shipment_status_transition" BEFORE UPDATE ON "Shipment"
WHEN NOT (
  (NEW."status" = 'open' AND NEW."signedBy" IS NULL AND NEW."signedAt" IS NULL AND NEW."decision" IS NULL)
  OR (NEW."status" = 'signed' AND OLD."status" = 'open' AND NEW."signedBy" IS NOT NULL AND NEW."signedAt" IS NOT NULL
      AND NEW."decision" IN ('accept', 'hold', 'reject') AND NEW."outcome" IS OLD."outcome" AND NEW."result" IS OLD."result")
)
BEGIN SELECT RAISE(ABORT, 'a shipment only changes from open to signed, once, with a decision, a signer and a time'); END;
CREATE TRIGGER "Shipment_no_delete" BEFORE DELETE ON "Shipment" BEGIN SELECT RAISE(ABORT, 'a shipment cannot be deleted'); END;
-- Which review stood for which logger and product is a record: never changed or removed.
CREATE TRIGGER "ShipmentReview_no_update" BEFORE UPDATE ON "ShipmentReview" BEGIN SELECT RAISE(ABORT, 'a shipment review link cannot be changed'); END;
CREATE TRIGGER "ShipmentReview_no_delete" BEFORE DELETE ON "ShipmentReview" BEGIN SELECT RAISE(ABORT, 'a shipment review link cannot be deleted'); END;
CREATE TRIGGER "Lane_no_delete" BEFORE DELETE ON "Lane" BEGIN SELECT RAISE(ABORT, 'a lane cannot be deleted'); END;
CREATE TRIGGER "Logger_no_delete" BEFORE DELETE ON "Logger" BEGIN SELECT RAISE(ABORT, 'a logger register entry cannot be deleted'); END;
