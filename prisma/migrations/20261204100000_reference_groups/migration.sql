-- CreateTable
CREATE TABLE "ReferenceGroup" (
    "id" UUID NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "circuitIds" UUID[],
    "source" VARCHAR(32) NOT NULL DEFAULT 'technician',
    "note" TEXT NOT NULL DEFAULT '',
    "createdById" UUID NOT NULL,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "clearedAt" TIMESTAMPTZ(3),
    "clearedById" UUID,

    CONSTRAINT "ReferenceGroup_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE INDEX "ReferenceGroup_repairOrderId_idx" ON "ReferenceGroup"("repairOrderId");

-- AddForeignKey
ALTER TABLE "ReferenceGroup" ADD CONSTRAINT "ReferenceGroup_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ReferenceGroup" ADD CONSTRAINT "ReferenceGroup_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- Grouping and clearing are in the trail like every other write.
CREATE TRIGGER "ReferenceGroup_audit" AFTER INSERT OR UPDATE ON "ReferenceGroup"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('reference_group', 'createdById');
