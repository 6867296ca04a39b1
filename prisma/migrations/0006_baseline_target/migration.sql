-- AlterTable
ALTER TABLE "Baseline" ADD COLUMN "quantity" TEXT NOT NULL DEFAULT 'value';
ALTER TABLE "Baseline" ADD COLUMN "period" TEXT NOT NULL DEFAULT 'other';
