-- Shares are kept against the e-mail the owner typed, whether or not an account has it
-- (THREATS.md: sharing must not tell the owner which e-mails have accounts). Existing shares
-- keep their account's e-mail.

-- AlterTable
ALTER TABLE "PanelShare" ADD COLUMN "email" TEXT;
UPDATE "PanelShare" SET "email" = "User"."email" FROM "User" WHERE "User"."id" = "PanelShare"."userId";
ALTER TABLE "PanelShare" DROP CONSTRAINT "PanelShare_userId_fkey";
ALTER TABLE "PanelShare" DROP CONSTRAINT "PanelShare_pkey";
ALTER TABLE "PanelShare" DROP COLUMN "userId";
ALTER TABLE "PanelShare" ALTER COLUMN "email" SET NOT NULL;
ALTER TABLE "PanelShare" ADD CONSTRAINT "PanelShare_pkey" PRIMARY KEY ("panelId", "email");

-- CreateIndex
CREATE INDEX "PanelShare_email_idx" ON "PanelShare"("email");
