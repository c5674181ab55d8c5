-- AlterTable
ALTER TABLE "Trace" ADD COLUMN "probeC" BLOB;

