-- CreateTable
CREATE TABLE "WaveformChunk" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "channel" TEXT NOT NULL DEFAULT 'co2',
    "startMs" REAL NOT NULL,
    "rateHz" REAL NOT NULL,
    "count" INTEGER NOT NULL,
    "data" BLOB NOT NULL,
    "source" TEXT NOT NULL,
    "importId" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT
);

-- CreateTable
CREATE TABLE "WaveformImport" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "fileHash" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "rateHz" REAL NOT NULL,
    "samples" INTEGER NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT
);

-- CreateTable
CREATE TABLE "Device" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "unitId" TEXT NOT NULL,
    "roomId" TEXT,
    "label" TEXT NOT NULL,
    "keyHash" TEXT,
    "sendingFacility" TEXT,
    "equipmentId" TEXT,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT
);

-- CreateTable
CREATE TABLE "ApiToken" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "name" TEXT NOT NULL,
    "tokenHash" TEXT NOT NULL,
    "scope" TEXT NOT NULL DEFAULT 'hl7',
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "revokedAt" DATETIME,
    "lastUsedAt" DATETIME
);

-- CreateTable
CREATE TABLE "Hl7Message" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "controlId" TEXT NOT NULL,
    "sendingApp" TEXT,
    "sendingFacility" TEXT,
    "receivedAt" DATETIME NOT NULL,
    "status" TEXT NOT NULL,
    "caseId" TEXT,
    "roomId" TEXT,
    "deviceId" TEXT,
    "location" TEXT,
    "samples" INTEGER NOT NULL DEFAULT 0,
    "error" TEXT,
    "raw" TEXT NOT NULL
);

-- CreateTable
CREATE TABLE "Hl7InboxSample" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "messageId" TEXT NOT NULL,
    "roomId" TEXT,
    "location" TEXT,
    "channel" TEXT NOT NULL,
    "atMs" REAL NOT NULL,
    "value" REAL NOT NULL
);

-- CreateTable
CREATE TABLE "BloodGas" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "caseId" TEXT NOT NULL,
    "at" DATETIME NOT NULL,
    "paco2" REAL NOT NULL,
    "enteredUnit" TEXT NOT NULL DEFAULT 'mmHg',
    "ph" REAL,
    "pao2" REAL,
    "fio2" REAL,
    "sampleType" TEXT NOT NULL DEFAULT 'arterial',
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "voidedAt" DATETIME,
    "voidedById" TEXT,
    "voidReason" TEXT
);

-- CreateTable
CREATE TABLE "SignInAttempt" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "username" TEXT NOT NULL,
    "origin" TEXT,
    "at" DATETIME NOT NULL,
    "success" BOOLEAN NOT NULL
);

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
