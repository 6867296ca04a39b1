-- AlterTable
ALTER TABLE "Baseline" ADD COLUMN     "firstPeriod" INTEGER NOT NULL DEFAULT 1;
