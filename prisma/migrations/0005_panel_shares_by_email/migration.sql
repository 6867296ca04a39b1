-- Shares are kept against the e-mail the owner typed, whether or not an account has it
-- (THREATS.md: sharing must not tell the owner which e-mails have accounts). Existing shares
-- keep their account's e-mail.

-- RedefineTables
PRAGMA defer_foreign_keys=ON;
PRAGMA foreign_keys=OFF;
CREATE TABLE "new_PanelShare" (
    "panelId" TEXT NOT NULL,
    "email" TEXT NOT NULL,
    "role" TEXT NOT NULL,

    PRIMARY KEY ("panelId", "email"),
    CONSTRAINT "PanelShare_panelId_fkey" FOREIGN KEY ("panelId") REFERENCES "Panel" ("id") ON DELETE CASCADE ON UPDATE CASCADE
);
INSERT INTO "new_PanelShare" ("panelId", "email", "role")
SELECT "PanelShare"."panelId", "User"."email", "PanelShare"."role" FROM "PanelShare" JOIN "User" ON "User"."id" = "PanelShare"."userId";
DROP TABLE "PanelShare";
ALTER TABLE "new_PanelShare" RENAME TO "PanelShare";
CREATE INDEX "PanelShare_email_idx" ON "PanelShare"("email");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;
