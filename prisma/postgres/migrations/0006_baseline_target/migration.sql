-- AlterTable
ALTER TABLE "Baseline" ADD COLUMN     "quantity" TEXT NOT NULL DEFAULT 'value',
ADD COLUMN     "period" TEXT NOT NULL DEFAULT 'other';
