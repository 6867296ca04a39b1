-- AlterTable
ALTER TABLE "Panel" ADD COLUMN "panelLeg" TEXT NOT NULL DEFAULT 'equal';

-- AlterTable
ALTER TABLE "Question" ADD COLUMN "calibration" BOOLEAN NOT NULL DEFAULT false;
ALTER TABLE "Question" ADD COLUMN "trueValue" REAL;
