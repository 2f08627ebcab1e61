-- CreateEnum
CREATE TYPE "CircuitPart" AS ENUM ('reference', 'signal', 'ground', 'sensor', 'module', 'connector', 'other');

-- CreateEnum
CREATE TYPE "ReviewDecision" AS ENUM ('approved', 'returned', 'withdrawn');

-- AlterTable
ALTER TABLE "Circuit" ADD COLUMN     "faultTreeId" UUID;

-- CreateTable
CREATE TABLE "Repair" (
    "id" UUID NOT NULL,
    "seq" SERIAL NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "circuitId" UUID,
    "part" "CircuitPart" NOT NULL,
    "action" TEXT NOT NULL,
    "location" TEXT NOT NULL DEFAULT '',
    "parts" JSONB NOT NULL DEFAULT '[]',
    "note" TEXT NOT NULL DEFAULT '',
    "byId" UUID NOT NULL,
    "at" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Repair_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Review" (
    "id" UUID NOT NULL,
    "seq" SERIAL NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "decision" "ReviewDecision" NOT NULL,
    "comment" TEXT NOT NULL DEFAULT '',
    "byId" UUID NOT NULL,
    "at" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Review_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "FaultTree" (
    "id" UUID NOT NULL,
    "shopId" UUID,
    "treeId" VARCHAR(64) NOT NULL,
    "version" VARCHAR(80) NOT NULL,
    "circuitKind" "CircuitKind" NOT NULL,
    "label" TEXT NOT NULL,
    "document" JSONB NOT NULL,
    "createdById" UUID,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "FaultTree_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ProofIssue" (
    "id" UUID NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "digest" VARCHAR(64) NOT NULL,
    "fileSha256" VARCHAR(64) NOT NULL,
    "view" JSONB NOT NULL,
    "issuedById" UUID NOT NULL,
    "issuedAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "ProofIssue_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE INDEX "ProofIssue_digest_idx" ON "ProofIssue"("digest");

-- CreateIndex
CREATE INDEX "ProofIssue_fileSha256_idx" ON "ProofIssue"("fileSha256");

-- CreateIndex
CREATE UNIQUE INDEX "ProofIssue_repairOrderId_fileSha256_key" ON "ProofIssue"("repairOrderId", "fileSha256");

-- CreateIndex
CREATE INDEX "Repair_repairOrderId_at_idx" ON "Repair"("repairOrderId", "at");

-- CreateIndex
CREATE INDEX "Review_repairOrderId_at_idx" ON "Review"("repairOrderId", "at");

-- CreateIndex
CREATE INDEX "FaultTree_treeId_version_idx" ON "FaultTree"("treeId", "version");

-- CreateIndex (NULLS NOT DISTINCT: a built-in tree version, with no shop, is stored once)
CREATE UNIQUE INDEX "FaultTree_shopId_treeId_version_key" ON "FaultTree"("shopId", "treeId", "version") NULLS NOT DISTINCT;

-- AddForeignKey
ALTER TABLE "Circuit" ADD CONSTRAINT "Circuit_faultTreeId_fkey" FOREIGN KEY ("faultTreeId") REFERENCES "FaultTree"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Repair" ADD CONSTRAINT "Repair_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Repair" ADD CONSTRAINT "Repair_circuitId_fkey" FOREIGN KEY ("circuitId") REFERENCES "Circuit"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Repair" ADD CONSTRAINT "Repair_byId_fkey" FOREIGN KEY ("byId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Review" ADD CONSTRAINT "Review_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Review" ADD CONSTRAINT "Review_byId_fkey" FOREIGN KEY ("byId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "FaultTree" ADD CONSTRAINT "FaultTree_shopId_fkey" FOREIGN KEY ("shopId") REFERENCES "Shop"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "FaultTree" ADD CONSTRAINT "FaultTree_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ProofIssue" ADD CONSTRAINT "ProofIssue_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ProofIssue" ADD CONSTRAINT "ProofIssue_issuedById_fkey" FOREIGN KEY ("issuedById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- Repairs, reviews and stored tree versions are evidence too: never changed in place, never deleted.
CREATE TRIGGER "Repair_append_only" BEFORE UPDATE OR DELETE ON "Repair"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();

CREATE TRIGGER "Review_append_only" BEFORE UPDATE OR DELETE ON "Review"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();

CREATE TRIGGER "ProofIssue_append_only" BEFORE UPDATE OR DELETE ON "ProofIssue"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();

CREATE TRIGGER "FaultTree_append_only" BEFORE UPDATE OR DELETE ON "FaultTree"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();
