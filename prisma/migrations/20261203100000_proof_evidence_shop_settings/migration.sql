-- AlterTable
ALTER TABLE "Shop" ADD COLUMN     "paperSize" VARCHAR(8) NOT NULL DEFAULT 'A4',
ADD COLUMN     "publicProofCheck" BOOLEAN NOT NULL DEFAULT true,
ADD COLUMN     "timeZone" VARCHAR(64) NOT NULL DEFAULT 'UTC';

-- AlterTable
ALTER TABLE "RepairOrder" ADD COLUMN     "codesAfterCheckedAt" TIMESTAMPTZ(3),
ADD COLUMN     "codesAfterKeyCycles" INTEGER,
ADD COLUMN     "codesAfterMethod" VARCHAR(32),
ADD COLUMN     "codesAfterNote" TEXT NOT NULL DEFAULT '',
ADD COLUMN     "odometerOut" INTEGER;

-- AlterTable
ALTER TABLE "Repair" ADD COLUMN     "clockOffAt" TIMESTAMPTZ(3),
ADD COLUMN     "clockOnAt" TIMESTAMPTZ(3),
ADD COLUMN     "labourMinutes" INTEGER;

-- AlterTable
ALTER TABLE "StatusChange" ADD COLUMN     "fromVersion" INTEGER;

-- AlterTable
ALTER TABLE "Review" ADD COLUMN     "evidenceDigest" VARCHAR(64) NOT NULL DEFAULT '',
ADD COLUMN     "position" INTEGER;

-- CreateIndex
CREATE UNIQUE INDEX "StatusChange_repairOrderId_fromVersion_key" ON "StatusChange"("repairOrderId", "fromVersion");

-- CreateIndex
CREATE UNIQUE INDEX "Review_repairOrderId_position_key" ON "Review"("repairOrderId", "position");

-- The shop's settings are recorded in the audit trail like its name and address.
DROP TRIGGER "Shop_audit" ON "Shop";
CREATE TRIGGER "Shop_audit" AFTER INSERT OR UPDATE OF "name", "address", "paperSize", "timeZone", "publicProofCheck" ON "Shop"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('shop', '', 'only', 'id', 'name', 'address', 'paperSize', 'timeZone', 'publicProofCheck');
