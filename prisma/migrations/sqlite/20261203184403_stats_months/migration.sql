-- CreateTable
CREATE TABLE "StatsMonth" (
    "ruleSetId" TEXT NOT NULL,
    "ruleSetVersion" INTEGER NOT NULL,
    "unitId" TEXT NOT NULL,
    "month" TEXT NOT NULL,
    "cases" INTEGER NOT NULL,
    "format" INTEGER NOT NULL,
    "digest" TEXT NOT NULL,
    "computedAt" DATETIME NOT NULL,
    "rows" TEXT NOT NULL,

    PRIMARY KEY ("ruleSetId", "ruleSetVersion", "unitId", "month")
);

-- CreateIndex
CREATE INDEX "Case_status_scheduledDate_unitId_idx" ON "Case"("status", "scheduledDate", "unitId");
