-- AlterTable
ALTER TABLE "CaseEvent" ADD COLUMN "note" TEXT;
