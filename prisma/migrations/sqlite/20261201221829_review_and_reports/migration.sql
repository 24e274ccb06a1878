-- CreateTable
CREATE TABLE "CaseReview" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'to_review',
    "category" TEXT,
    "comment" TEXT,
    "followUp" TEXT,
    "reviewerId" TEXT,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" DATETIME NOT NULL
);

-- CreateTable
CREATE TABLE "IssuedReport" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "reportKey" TEXT NOT NULL,
    "version" INTEGER NOT NULL,
    "periodKind" TEXT NOT NULL,
    "periodStart" TEXT NOT NULL,
    "periodEnd" TEXT NOT NULL,
    "scope" TEXT NOT NULL,
    "catalogueVersion" INTEGER NOT NULL,
    "ruleSetId" TEXT NOT NULL,
    "ruleSetVersion" INTEGER NOT NULL,
    "resultJson" TEXT NOT NULL,
    "diffJson" TEXT,
    "issuedById" TEXT NOT NULL,
    "issuedAt" DATETIME NOT NULL
);

-- CreateTable
CREATE TABLE "ReportCaseRef" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "reportId" TEXT NOT NULL,
    "ref" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    CONSTRAINT "ReportCaseRef_reportId_fkey" FOREIGN KEY ("reportId") REFERENCES "IssuedReport" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateIndex
CREATE UNIQUE INDEX "CaseReview_caseId_key" ON "CaseReview"("caseId");

-- CreateIndex
CREATE UNIQUE INDEX "IssuedReport_reportKey_version_key" ON "IssuedReport"("reportKey", "version");

-- CreateIndex
CREATE UNIQUE INDEX "ReportCaseRef_reportId_ref_key" ON "ReportCaseRef"("reportId", "ref");
