-- AlterTable
ALTER TABLE "Review" ADD COLUMN "coolantC" BLOB;
ALTER TABLE "Review" ADD COLUMN "meanC" BLOB;
ALTER TABLE "Review" ADD COLUMN "surfaceC" BLOB;

