-- CreateSchema
CREATE SCHEMA IF NOT EXISTS "public";

-- CreateTable
CREATE TABLE "Site" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Site_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Unit" (
    "id" TEXT NOT NULL,
    "siteId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "timeZone" TEXT NOT NULL,
    "vitalsReminderMin" INTEGER NOT NULL DEFAULT 5,
    "reviewResponseLimitS" INTEGER NOT NULL DEFAULT 60,
    "activeRuleSetId" TEXT NOT NULL DEFAULT 'plateau-default',
    "activeRuleSetVersion" INTEGER NOT NULL DEFAULT 1,
    "defaultRoomId" TEXT,
    "usualProceduralistId" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Unit_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Room" (
    "id" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "location" TEXT,
    "sortOrder" INTEGER NOT NULL DEFAULT 0,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Room_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "User" (
    "id" TEXT NOT NULL,
    "username" TEXT NOT NULL,
    "displayName" TEXT NOT NULL,
    "role" TEXT NOT NULL,
    "passwordHash" TEXT NOT NULL,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "unitId" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "User_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Session" (
    "id" TEXT NOT NULL,
    "userId" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "lastSeenAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMP(3) NOT NULL,
    "revokedAt" TIMESTAMP(3),
    "origin" TEXT,

    CONSTRAINT "Session_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Proceduralist" (
    "id" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "specialty" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Proceduralist_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ProcedureType" (
    "id" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "label" TEXT NOT NULL,
    "typicalMin" INTEGER NOT NULL DEFAULT 20,
    "active" BOOLEAN NOT NULL DEFAULT true,

    CONSTRAINT "ProcedureType_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Drug" (
    "id" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "drugClass" TEXT NOT NULL,
    "defaultUnit" TEXT NOT NULL,
    "defaultRoute" TEXT NOT NULL DEFAULT 'IV',
    "usualDose" DOUBLE PRECISION,
    "cautionAbove" DOUBLE PRECISION,
    "concentration" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "sortOrder" INTEGER NOT NULL DEFAULT 0,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Drug_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Patient" (
    "id" TEXT NOT NULL,
    "siteId" TEXT NOT NULL,
    "mrn" TEXT NOT NULL,
    "familyName" TEXT NOT NULL,
    "givenName" TEXT NOT NULL,
    "birthDate" TEXT NOT NULL,
    "sex" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "Patient_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Case" (
    "id" TEXT NOT NULL,
    "key" TEXT,
    "patientId" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "roomId" TEXT,
    "procedureType" TEXT NOT NULL,
    "plannedDepth" TEXT NOT NULL,
    "reachedDepth" TEXT,
    "asaClass" TEXT,
    "asaEmergency" BOOLEAN NOT NULL DEFAULT false,
    "weightKg" DOUBLE PRECISION,
    "heightCm" DOUBLE PRECISION,
    "neckCm" DOUBLE PRECISION,
    "sbSnoring" BOOLEAN,
    "sbTired" BOOLEAN,
    "sbObserved" BOOLEAN,
    "sbPressure" BOOLEAN,
    "sbNeck" BOOLEAN,
    "airwayClass" TEXT,
    "fastingSolidsAt" TIMESTAMP(3),
    "fastingClearsAt" TIMESTAMP(3),
    "allergies" TEXT,
    "baselineSpo2" DOUBLE PRECISION,
    "oxygenDelivery" TEXT,
    "proceduralistId" TEXT,
    "nurseId" TEXT,
    "status" TEXT NOT NULL DEFAULT 'draft',
    "scheduledDate" TEXT NOT NULL,
    "startAt" TIMESTAMP(3) NOT NULL,
    "etco2Unit" TEXT NOT NULL DEFAULT 'mmHg',
    "nurseText" TEXT,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "Case_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Dose" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "drugId" TEXT,
    "drug" TEXT NOT NULL,
    "drugClass" TEXT NOT NULL,
    "amount" DOUBLE PRECISION NOT NULL,
    "unit" TEXT NOT NULL,
    "route" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,

    CONSTRAINT "Dose_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Sample" (
    "id" SERIAL NOT NULL,
    "caseId" TEXT NOT NULL,
    "channel" TEXT NOT NULL,
    "atMs" DOUBLE PRECISION NOT NULL,
    "value" DOUBLE PRECISION NOT NULL,
    "source" TEXT NOT NULL,
    "probeOff" BOOLEAN NOT NULL DEFAULT false,
    "importId" TEXT,

    CONSTRAINT "Sample_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "SampleImport" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "fileHash" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "rows" INTEGER NOT NULL,
    "samples" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "SampleImport_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Intervention" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "note" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,

    CONSTRAINT "Intervention_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CaseEvent" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "note" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,

    CONSTRAINT "CaseEvent_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ManualVital" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "sbp" DOUBLE PRECISION,
    "dbp" DOUBLE PRECISION,
    "hr" DOUBLE PRECISION,
    "spo2" DOUBLE PRECISION,
    "rr" DOUBLE PRECISION,
    "etco2" DOUBLE PRECISION,
    "sedationScore" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,
    "replacesId" TEXT,

    CONSTRAINT "ManualVital_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RecoveryScore" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "activity" INTEGER NOT NULL,
    "respiration" INTEGER NOT NULL,
    "circulation" INTEGER NOT NULL,
    "consciousness" INTEGER NOT NULL,
    "oxygenation" INTEGER NOT NULL,
    "total" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,

    CONSTRAINT "RecoveryScore_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RuleSetVersion" (
    "id" TEXT NOT NULL,
    "ruleSetId" TEXT NOT NULL,
    "version" INTEGER NOT NULL,
    "definition" TEXT NOT NULL,
    "builtIn" BOOLEAN NOT NULL DEFAULT false,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "RuleSetVersion_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CaseSummary" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "ruleSetId" TEXT NOT NULL,
    "ruleSetVersion" INTEGER NOT NULL,
    "inputHash" TEXT NOT NULL,
    "computedAt" TIMESTAMP(3) NOT NULL,
    "caseLevel" TEXT NOT NULL,
    "majorPhysiology" BOOLEAN NOT NULL,
    "episodeCount" INTEGER NOT NULL,
    "lowestSpo2" DOUBLE PRECISION,
    "highestEtco2" DOUBLE PRECISION,
    "lowestEtco2" DOUBLE PRECISION,
    "lowestRr" DOUBLE PRECISION,
    "capnoCoveragePct" DOUBLE PRECISION,
    "sedationS" DOUBLE PRECISION,
    "firstApneaResponseS" DOUBLE PRECISION,
    "analysisJson" TEXT NOT NULL,

    CONSTRAINT "CaseSummary_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CaseSummaryRule" (
    "id" SERIAL NOT NULL,
    "summaryId" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "ruleId" TEXT NOT NULL,
    "episodes" INTEGER NOT NULL,
    "totalDurationS" DOUBLE PRECISION NOT NULL,
    "maxDurationS" DOUBLE PRECISION NOT NULL,
    "firstResponseS" DOUBLE PRECISION,

    CONSTRAINT "CaseSummaryRule_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AuditEntry" (
    "seq" SERIAL NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
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
    "hash" TEXT NOT NULL,

    CONSTRAINT "AuditEntry_pkey" PRIMARY KEY ("seq")
);

-- CreateTable
CREATE TABLE "CaseReview" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'to_review',
    "category" TEXT,
    "comment" TEXT,
    "followUp" TEXT,
    "reviewerId" TEXT,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "CaseReview_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "IssuedReport" (
    "id" TEXT NOT NULL,
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
    "issuedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "IssuedReport_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ReportCaseRef" (
    "id" SERIAL NOT NULL,
    "reportId" TEXT NOT NULL,
    "ref" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,

    CONSTRAINT "ReportCaseRef_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "NoteVersion" (
    "id" TEXT NOT NULL,
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
    "createdAt" TIMESTAMP(3) NOT NULL,
    "cosignRequired" BOOLEAN NOT NULL DEFAULT false,
    "cosignedById" TEXT,
    "cosignedAt" TIMESTAMP(3),

    CONSTRAINT "NoteVersion_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "WaveformChunk" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "channel" TEXT NOT NULL DEFAULT 'co2',
    "startMs" DOUBLE PRECISION NOT NULL,
    "rateHz" DOUBLE PRECISION NOT NULL,
    "count" INTEGER NOT NULL,
    "data" BYTEA NOT NULL,
    "source" TEXT NOT NULL,
    "importId" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "WaveformChunk_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "WaveformImport" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "fileHash" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "rateHz" DOUBLE PRECISION NOT NULL,
    "samples" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "WaveformImport_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Device" (
    "id" TEXT NOT NULL,
    "unitId" TEXT NOT NULL,
    "roomId" TEXT,
    "label" TEXT NOT NULL,
    "keyHash" TEXT,
    "sendingFacility" TEXT,
    "equipmentId" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,

    CONSTRAINT "Device_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ApiToken" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "tokenHash" TEXT NOT NULL,
    "scope" TEXT NOT NULL DEFAULT 'hl7',
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "revokedAt" TIMESTAMP(3),
    "lastUsedAt" TIMESTAMP(3),

    CONSTRAINT "ApiToken_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Hl7Message" (
    "id" TEXT NOT NULL,
    "controlId" TEXT NOT NULL,
    "sendingApp" TEXT,
    "sendingFacility" TEXT,
    "receivedAt" TIMESTAMP(3) NOT NULL,
    "status" TEXT NOT NULL,
    "caseId" TEXT,
    "roomId" TEXT,
    "deviceId" TEXT,
    "location" TEXT,
    "samples" INTEGER NOT NULL DEFAULT 0,
    "error" TEXT,
    "raw" TEXT NOT NULL,

    CONSTRAINT "Hl7Message_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Hl7InboxSample" (
    "id" SERIAL NOT NULL,
    "messageId" TEXT NOT NULL,
    "roomId" TEXT,
    "location" TEXT,
    "channel" TEXT NOT NULL,
    "atMs" DOUBLE PRECISION NOT NULL,
    "value" DOUBLE PRECISION NOT NULL,

    CONSTRAINT "Hl7InboxSample_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "BloodGas" (
    "id" TEXT NOT NULL,
    "caseId" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "paco2" DOUBLE PRECISION NOT NULL,
    "enteredUnit" TEXT NOT NULL DEFAULT 'mmHg',
    "ph" DOUBLE PRECISION,
    "pao2" DOUBLE PRECISION,
    "fio2" DOUBLE PRECISION,
    "sampleType" TEXT NOT NULL DEFAULT 'arterial',
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" TIMESTAMP(3),
    "voidedById" TEXT,
    "voidReason" TEXT,

    CONSTRAINT "BloodGas_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "SignInAttempt" (
    "id" SERIAL NOT NULL,
    "username" TEXT NOT NULL,
    "origin" TEXT,
    "at" TIMESTAMP(3) NOT NULL,
    "success" BOOLEAN NOT NULL,

    CONSTRAINT "SignInAttempt_pkey" PRIMARY KEY ("id")
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

-- CreateIndex
CREATE UNIQUE INDEX "CaseReview_caseId_key" ON "CaseReview"("caseId");

-- CreateIndex
CREATE UNIQUE INDEX "IssuedReport_reportKey_version_key" ON "IssuedReport"("reportKey", "version");

-- CreateIndex
CREATE UNIQUE INDEX "ReportCaseRef_reportId_ref_key" ON "ReportCaseRef"("reportId", "ref");

-- CreateIndex
CREATE UNIQUE INDEX "NoteVersion_caseId_version_key" ON "NoteVersion"("caseId", "version");

-- CreateIndex
CREATE INDEX "WaveformChunk_caseId_channel_startMs_idx" ON "WaveformChunk"("caseId", "channel", "startMs");

-- CreateIndex
CREATE UNIQUE INDEX "WaveformImport_caseId_fileHash_key" ON "WaveformImport"("caseId", "fileHash");

-- CreateIndex
CREATE UNIQUE INDEX "ApiToken_tokenHash_key" ON "ApiToken"("tokenHash");

-- CreateIndex
CREATE INDEX "Hl7Message_sendingFacility_controlId_idx" ON "Hl7Message"("sendingFacility", "controlId");

-- CreateIndex
CREATE INDEX "Hl7Message_status_receivedAt_idx" ON "Hl7Message"("status", "receivedAt");

-- CreateIndex
CREATE INDEX "Hl7InboxSample_messageId_idx" ON "Hl7InboxSample"("messageId");

-- CreateIndex
CREATE INDEX "Hl7InboxSample_roomId_atMs_idx" ON "Hl7InboxSample"("roomId", "atMs");

-- CreateIndex
CREATE INDEX "BloodGas_caseId_at_idx" ON "BloodGas"("caseId", "at");

-- CreateIndex
CREATE INDEX "SignInAttempt_username_at_idx" ON "SignInAttempt"("username", "at");

-- CreateIndex
CREATE INDEX "SignInAttempt_origin_at_idx" ON "SignInAttempt"("origin", "at");

-- AddForeignKey
ALTER TABLE "Unit" ADD CONSTRAINT "Unit_siteId_fkey" FOREIGN KEY ("siteId") REFERENCES "Site"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Room" ADD CONSTRAINT "Room_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "User" ADD CONSTRAINT "User_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Session" ADD CONSTRAINT "Session_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Proceduralist" ADD CONSTRAINT "Proceduralist_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ProcedureType" ADD CONSTRAINT "ProcedureType_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Drug" ADD CONSTRAINT "Drug_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Patient" ADD CONSTRAINT "Patient_siteId_fkey" FOREIGN KEY ("siteId") REFERENCES "Site"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Case" ADD CONSTRAINT "Case_patientId_fkey" FOREIGN KEY ("patientId") REFERENCES "Patient"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Case" ADD CONSTRAINT "Case_unitId_fkey" FOREIGN KEY ("unitId") REFERENCES "Unit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Case" ADD CONSTRAINT "Case_roomId_fkey" FOREIGN KEY ("roomId") REFERENCES "Room"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Case" ADD CONSTRAINT "Case_proceduralistId_fkey" FOREIGN KEY ("proceduralistId") REFERENCES "Proceduralist"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Case" ADD CONSTRAINT "Case_nurseId_fkey" FOREIGN KEY ("nurseId") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Dose" ADD CONSTRAINT "Dose_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Sample" ADD CONSTRAINT "Sample_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Intervention" ADD CONSTRAINT "Intervention_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CaseEvent" ADD CONSTRAINT "CaseEvent_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ManualVital" ADD CONSTRAINT "ManualVital_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RecoveryScore" ADD CONSTRAINT "RecoveryScore_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CaseSummary" ADD CONSTRAINT "CaseSummary_caseId_fkey" FOREIGN KEY ("caseId") REFERENCES "Case"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CaseSummaryRule" ADD CONSTRAINT "CaseSummaryRule_summaryId_fkey" FOREIGN KEY ("summaryId") REFERENCES "CaseSummary"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ReportCaseRef" ADD CONSTRAINT "ReportCaseRef_reportId_fkey" FOREIGN KEY ("reportId") REFERENCES "IssuedReport"("id") ON DELETE RESTRICT ON UPDATE CASCADE;
