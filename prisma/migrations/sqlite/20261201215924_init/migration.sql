-- CreateTable
CREATE TABLE "Site" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Unit" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "siteId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "timeZone" TEXT NOT NULL,
    "vitalsReminderMin" INTEGER NOT NULL DEFAULT 5,
    "reviewResponseLimitS" INTEGER NOT NULL DEFAULT 60,
    "activeRuleSetId" TEXT NOT NULL DEFAULT 'plateau-default',
    "activeRuleSetVersion" INTEGER NOT NULL DEFAULT 1,
    "defaultRoomId" TEXT,
    "usualProceduralistId" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Unit_siteId_fkey" FOREIGN KEY ("siteId") REFERENCES "Site" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Room" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "location" TEXT,
    "sortOrder" INTEGER NOT NULL DEFAULT 0,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Room_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "User" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "username" TEXT NOT NULL,
    "displayName" TEXT NOT NULL,
    "role" TEXT NOT NULL,
    "passwordHash" TEXT NOT NULL,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "unitId" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    CONSTRAINT "User_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Session" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "userId" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "lastSeenAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" DATETIME NOT NULL,
    "revokedAt" DATETIME,
    "origin" TEXT,
    CONSTRAINT "Session_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Proceduralist" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "specialty" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Proceduralist_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "ProcedureType" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "unitId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "label" TEXT NOT NULL,
    "typicalMin" INTEGER NOT NULL DEFAULT 20,
    "active" BOOLEAN NOT NULL DEFAULT true,
    CONSTRAINT "ProcedureType_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Drug" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "drugClass" TEXT NOT NULL,
    "defaultUnit" TEXT NOT NULL,
    "defaultRoute" TEXT NOT NULL DEFAULT 'IV',
    "usualDose" REAL,
    "cautionAbove" REAL,
    "concentration" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "sortOrder" INTEGER NOT NULL DEFAULT 0,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Drug_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Patient" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "siteId" TEXT NOT NULL,
    "mrn" TEXT NOT NULL,
    "familyName" TEXT NOT NULL,
    "givenName" TEXT NOT NULL,
    "birthDate" TEXT NOT NULL,
    "sex" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    CONSTRAINT "Patient_siteId_fkey" FOREIGN KEY ("siteId") REFERENCES "Site" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Case" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "key" TEXT,
    "patientId" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "roomId" TEXT,
    "procedureType" TEXT NOT NULL,
    "plannedDepth" TEXT NOT NULL,
    "reachedDepth" TEXT,
    "asaClass" TEXT,
    "asaEmergency" BOOLEAN NOT NULL DEFAULT false,
    "weightKg" REAL,
    "heightCm" REAL,
    "neckCm" REAL,
    "sbSnoring" BOOLEAN,
    "sbTired" BOOLEAN,
    "sbObserved" BOOLEAN,
    "sbPressure" BOOLEAN,
    "sbNeck" BOOLEAN,
    "airwayClass" TEXT,
    "fastingSolidsAt" DATETIME,
    "fastingClearsAt" DATETIME,
    "allergies" TEXT,
    "baselineSpo2" REAL,
    "oxygenDelivery" TEXT,
    "proceduralistId" TEXT,
    "nurseId" TEXT,
    "status" TEXT NOT NULL DEFAULT 'draft',
    "scheduledDate" TEXT NOT NULL,
    "startAt" DATETIME NOT NULL,
    "etco2Unit" TEXT NOT NULL DEFAULT 'mmHg',
    "nurseText" TEXT,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "updatedAt" DATETIME NOT NULL,
    CONSTRAINT "Case_patientId_fkey" FOREIGN KEY ("patientId") REFERENCES "Patient" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Case_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "Case_roomId_fkey" FOREIGN KEY ("roomId") REFERENCES "Room" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Case_proceduralistId_fkey" FOREIGN KEY ("proceduralistId") REFERENCES "Proceduralist" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Case_nurseId_fkey" FOREIGN KEY ("nurseId") REFERENCES "User" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Dose" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "drugId" TEXT,
    "drug" TEXT NOT NULL,
    "drugClass" TEXT NOT NULL,
    "amount" REAL NOT NULL,
    "unit" TEXT NOT NULL,
    "route" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,
    CONSTRAINT "Dose_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Sample" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "caseId" TEXT NOT NULL,
    "channel" TEXT NOT NULL,
    "atMs" REAL NOT NULL,
    "value" REAL NOT NULL,
    "source" TEXT NOT NULL,
    "probeOff" BOOLEAN NOT NULL DEFAULT false,
    "importId" TEXT,
    CONSTRAINT "Sample_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "SampleImport" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "fileHash" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "rows" INTEGER NOT NULL,
    "samples" INTEGER NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT
);

-- CreateTable
CREATE TABLE "Intervention" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "note" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,
    CONSTRAINT "Intervention_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "CaseEvent" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,
    CONSTRAINT "CaseEvent_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "ManualVital" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "sbp" REAL,
    "dbp" REAL,
    "hr" REAL,
    "spo2" REAL,
    "rr" REAL,
    "etco2" REAL,
    "sedationScore" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,
    CONSTRAINT "ManualVital_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "RecoveryScore" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "activity" INTEGER NOT NULL,
    "respiration" INTEGER NOT NULL,
    "circulation" INTEGER NOT NULL,
    "consciousness" INTEGER NOT NULL,
    "oxygenation" INTEGER NOT NULL,
    "total" INTEGER NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT,
    CONSTRAINT "RecoveryScore_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "RuleSetVersion" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "ruleSetId" TEXT NOT NULL,
    "version" INTEGER NOT NULL,
    "definition" TEXT NOT NULL,
    "builtIn" BOOLEAN NOT NULL DEFAULT false,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT
);

-- CreateTable
CREATE TABLE "CaseSummary" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "ruleSetId" TEXT NOT NULL,
    "ruleSetVersion" INTEGER NOT NULL,
    "inputHash" TEXT NOT NULL,
    "computedAt" DATETIME NOT NULL,
    "caseLevel" TEXT NOT NULL,
    "majorPhysiology" BOOLEAN NOT NULL,
    "episodeCount" INTEGER NOT NULL,
    "lowestSpo2" REAL,
    "highestEtco2" REAL,
    "lowestEtco2" REAL,
    "lowestRr" REAL,
    "capnoCoveragePct" REAL,
    "sedationS" REAL,
    "firstApneaResponseS" REAL,
    "analysisJson" TEXT NOT NULL,
    CONSTRAINT "CaseSummary_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "CaseSummaryRule" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "summaryId" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "ruleId" TEXT NOT NULL,
    "episodes" INTEGER NOT NULL,
    "totalDurationS" REAL NOT NULL,
    "maxDurationS" REAL NOT NULL,
    "firstResponseS" REAL,
    CONSTRAINT "CaseSummaryRule_summaryId_fkey" FOREIGN KEY ("summaryId") REFERENCES "CaseSummary" ("id") ON DELETE CASCADE ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "AuditEntry" (
    "seq" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "at" DATETIME NOT NULL,
    "actorId" TEXT,
    "role" TEXT,
    "action" TEXT NOT NULL,
    "entity" TEXT NOT NULL,
    "entityId" TEXT,
    "caseId" TEXT,
    "before" TEXT,
    "after" TEXT,
    "origin" TEXT,
    "prevHash" TEXT NOT NULL,
    "hash" TEXT NOT NULL
);

-- CreateIndex
CREATE UNIQUE INDEX "Room_unitId_name_key" ON "Room"("unitId", "name");

-- CreateIndex
CREATE UNIQUE INDEX "User_username_key" ON "User"("username");

-- CreateIndex
CREATE INDEX "Session_userId_idx" ON "Session"("userId");

-- CreateIndex
CREATE UNIQUE INDEX "ProcedureType_unitId_code_key" ON "ProcedureType"("unitId", "code");

-- CreateIndex
CREATE UNIQUE INDEX "Drug_unitId_name_key" ON "Drug"("unitId", "name");

-- CreateIndex
CREATE INDEX "Patient_familyName_idx" ON "Patient"("familyName");

-- CreateIndex
CREATE UNIQUE INDEX "Patient_siteId_mrn_key" ON "Patient"("siteId", "mrn");

-- CreateIndex
CREATE UNIQUE INDEX "Case_key_key" ON "Case"("key");

-- CreateIndex
CREATE INDEX "Case_unitId_scheduledDate_idx" ON "Case"("unitId", "scheduledDate");

-- CreateIndex
CREATE INDEX "Case_patientId_idx" ON "Case"("patientId");

-- CreateIndex
CREATE INDEX "Dose_caseId_at_idx" ON "Dose"("caseId", "at");

-- CreateIndex
CREATE UNIQUE INDEX "Sample_caseId_channel_source_atMs_key" ON "Sample"("caseId", "channel", "source", "atMs");

-- CreateIndex
CREATE UNIQUE INDEX "SampleImport_caseId_fileHash_key" ON "SampleImport"("caseId", "fileHash");

-- CreateIndex
CREATE INDEX "Intervention_caseId_at_idx" ON "Intervention"("caseId", "at");

-- CreateIndex
CREATE INDEX "CaseEvent_caseId_at_idx" ON "CaseEvent"("caseId", "at");

-- CreateIndex
CREATE INDEX "ManualVital_caseId_at_idx" ON "ManualVital"("caseId", "at");

-- CreateIndex
CREATE INDEX "RecoveryScore_caseId_at_idx" ON "RecoveryScore"("caseId", "at");

-- CreateIndex
CREATE UNIQUE INDEX "RuleSetVersion_ruleSetId_version_key" ON "RuleSetVersion"("ruleSetId", "version");

-- CreateIndex
CREATE INDEX "CaseSummary_ruleSetId_ruleSetVersion_caseLevel_idx" ON "CaseSummary"("ruleSetId", "ruleSetVersion", "caseLevel");

-- CreateIndex
CREATE UNIQUE INDEX "CaseSummary_caseId_ruleSetId_ruleSetVersion_key" ON "CaseSummary"("caseId", "ruleSetId", "ruleSetVersion");

-- CreateIndex
CREATE INDEX "CaseSummaryRule_ruleId_caseId_idx" ON "CaseSummaryRule"("ruleId", "caseId");

-- CreateIndex
CREATE UNIQUE INDEX "CaseSummaryRule_summaryId_ruleId_key" ON "CaseSummaryRule"("summaryId", "ruleId");

-- CreateIndex
CREATE INDEX "AuditEntry_caseId_idx" ON "AuditEntry"("caseId");

-- CreateIndex
CREATE INDEX "AuditEntry_actorId_at_idx" ON "AuditEntry"("actorId", "at");
