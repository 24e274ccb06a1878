-- CreateTable
CREATE TABLE "NoteVersion" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "version" INTEGER NOT NULL,
    "kind" TEXT NOT NULL,
    "reason" TEXT,
    "text" TEXT NOT NULL,
    "structuredJson" TEXT NOT NULL,
    "analysisJson" TEXT NOT NULL,
    "recordJson" TEXT NOT NULL,
    "ruleSetId" TEXT NOT NULL,
    "ruleSetVersion" INTEGER NOT NULL,
    "nurseText" TEXT,
    "authorId" TEXT NOT NULL,
    "authorRole" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL,
    "cosignRequired" BOOLEAN NOT NULL DEFAULT false,
    "cosignedById" TEXT,
    "cosignedAt" DATETIME
);

-- CreateIndex
CREATE UNIQUE INDEX "NoteVersion_caseId_version_key" ON "NoteVersion"("caseId", "version");
