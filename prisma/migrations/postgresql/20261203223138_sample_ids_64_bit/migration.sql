-- Sample and Hl7InboxSample keys 64-bit: a large system's 1 Hz traces pass 2^31 samples within a
-- few years. Edited by hand from what `npm run db:diff` wrote ("SET DATA TYPE BIGSERIAL", which
-- PostgreSQL refuses: bigserial is no type): widen the column and its sequence instead. The
-- migrations test checks the result matches the schema.

-- AlterTable
ALTER TABLE "Hl7InboxSample" ALTER COLUMN "id" SET DATA TYPE BIGINT;
ALTER SEQUENCE "Hl7InboxSample_id_seq" AS BIGINT;

-- AlterTable
ALTER TABLE "Sample" ALTER COLUMN "id" SET DATA TYPE BIGINT;
ALTER SEQUENCE "Sample_id_seq" AS BIGINT;
