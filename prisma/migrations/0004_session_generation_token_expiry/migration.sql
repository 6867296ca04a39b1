-- AlterTable
ALTER TABLE "ApiToken" ADD COLUMN "expiresAt" DATETIME;

-- AlterTable
ALTER TABLE "User" ADD COLUMN "sessionGeneration" INTEGER NOT NULL DEFAULT 0;
