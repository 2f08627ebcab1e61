-- CreateEnum
CREATE TYPE "Role" AS ENUM ('technician', 'foreman', 'admin');

-- CreateEnum
CREATE TYPE "RepairOrderStatus" AS ENUM ('open', 'diagnosing', 'repaired', 'verified', 'closed');

-- CreateEnum
CREATE TYPE "CircuitKind" AS ENUM ('three_wire_5v', 'two_wire_thermistor', 'shared_5v_reference');

-- CreateEnum
CREATE TYPE "Quantity" AS ENUM ('dc_volts', 'ohms', 'amps', 'scan_value');

-- CreateEnum
CREATE TYPE "ProbePoint" AS ENUM ('reference', 'signal', 'ground', 'battery_negative', 'battery_positive', 'chassis_ground');

-- CreateEnum
CREATE TYPE "ProbeLocation" AS ENUM ('sensor_connector', 'module_connector');

-- CreateEnum
CREATE TYPE "ConnectorState" AS ENUM ('plugged', 'unplugged', 'backprobed');

-- CreateEnum
CREATE TYPE "KeyState" AS ENUM ('off', 'on');

-- CreateEnum
CREATE TYPE "EngineState" AS ENUM ('off', 'cranking', 'running');

-- CreateEnum
CREATE TYPE "Phase" AS ENUM ('diagnosis', 'verification');

-- CreateTable
CREATE TABLE "Shop" (
    "id" UUID NOT NULL,
    "name" TEXT NOT NULL,
    "address" TEXT NOT NULL DEFAULT '',
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Shop_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "User" (
    "id" UUID NOT NULL,
    "shopId" UUID NOT NULL,
    "name" TEXT NOT NULL,
    "email" TEXT NOT NULL,
    "role" "Role" NOT NULL,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "User_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Vehicle" (
    "id" UUID NOT NULL,
    "shopId" UUID NOT NULL,
    "vin" VARCHAR(17) NOT NULL,
    "outsideNorthAmerica" BOOLEAN NOT NULL DEFAULT false,
    "year" INTEGER NOT NULL,
    "make" TEXT NOT NULL,
    "model" TEXT NOT NULL,
    "engine" TEXT NOT NULL DEFAULT '',
    "odometer" INTEGER NOT NULL,
    "odometerUnit" VARCHAR(2) NOT NULL DEFAULT 'mi',
    "createdById" UUID NOT NULL,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Vehicle_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RepairOrder" (
    "id" UUID NOT NULL,
    "shopId" UUID NOT NULL,
    "number" VARCHAR(32) NOT NULL,
    "vehicleId" UUID NOT NULL,
    "technicianId" UUID,
    "status" "RepairOrderStatus" NOT NULL DEFAULT 'open',
    "complaint" TEXT NOT NULL,
    "cause" TEXT NOT NULL DEFAULT '',
    "correction" TEXT NOT NULL DEFAULT '',
    "codes" TEXT[] DEFAULT ARRAY[]::TEXT[],
    "codesAfter" TEXT[] DEFAULT ARRAY[]::TEXT[],
    "odometerIn" INTEGER,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdById" UUID NOT NULL,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "RepairOrder_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "StatusChange" (
    "id" UUID NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "fromStatus" "RepairOrderStatus",
    "toStatus" "RepairOrderStatus" NOT NULL,
    "reason" TEXT NOT NULL DEFAULT '',
    "byId" UUID NOT NULL,
    "at" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "StatusChange_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Circuit" (
    "id" UUID NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "kind" "CircuitKind" NOT NULL,
    "sensor" VARCHAR(64) NOT NULL,
    "label" TEXT NOT NULL,
    "cavities" JSONB NOT NULL DEFAULT '{}',
    "createdById" UUID NOT NULL,
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Circuit_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Measurement" (
    "id" UUID NOT NULL,
    "seq" SERIAL NOT NULL,
    "repairOrderId" UUID NOT NULL,
    "circuitId" UUID NOT NULL,
    "quantity" "Quantity" NOT NULL,
    "at" "ProbePoint" NOT NULL,
    "against" "ProbePoint",
    "location" "ProbeLocation" NOT NULL,
    "connector" "ConnectorState" NOT NULL,
    "key" "KeyState" NOT NULL,
    "engine" "EngineState" NOT NULL,
    "jumpers" JSONB NOT NULL DEFAULT '[]',
    "pid" VARCHAR(32),
    "sensor" VARCHAR(64),
    "valueEntered" DOUBLE PRECISION,
    "unitEntered" VARCHAR(16) NOT NULL,
    "valueSi" DOUBLE PRECISION,
    "overload" BOOLEAN NOT NULL DEFAULT false,
    "siUnit" VARCHAR(16) NOT NULL,
    "meterOhms" DOUBLE PRECISION NOT NULL DEFAULT 10000000,
    "phase" "Phase" NOT NULL DEFAULT 'diagnosis',
    "note" TEXT NOT NULL DEFAULT '',
    "supersedesId" UUID,
    "clientKey" VARCHAR(64),
    "takenById" UUID NOT NULL,
    "takenAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Measurement_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE INDEX "User_shopId_role_idx" ON "User"("shopId", "role");

-- CreateIndex
CREATE UNIQUE INDEX "User_email_key" ON "User"("email");

-- CreateIndex
CREATE UNIQUE INDEX "Vehicle_shopId_vin_key" ON "Vehicle"("shopId", "vin");

-- CreateIndex
CREATE INDEX "RepairOrder_shopId_status_updatedAt_idx" ON "RepairOrder"("shopId", "status", "updatedAt");

-- CreateIndex
CREATE INDEX "RepairOrder_technicianId_idx" ON "RepairOrder"("technicianId");

-- CreateIndex
CREATE UNIQUE INDEX "RepairOrder_shopId_number_key" ON "RepairOrder"("shopId", "number");

-- CreateIndex
CREATE INDEX "StatusChange_repairOrderId_at_idx" ON "StatusChange"("repairOrderId", "at");

-- CreateIndex
CREATE INDEX "Circuit_repairOrderId_idx" ON "Circuit"("repairOrderId");

-- CreateIndex
CREATE UNIQUE INDEX "Measurement_supersedesId_key" ON "Measurement"("supersedesId");

-- CreateIndex
CREATE UNIQUE INDEX "Measurement_repairOrderId_clientKey_key" ON "Measurement"("repairOrderId", "clientKey");

-- CreateIndex
CREATE INDEX "Measurement_repairOrderId_takenAt_idx" ON "Measurement"("repairOrderId", "takenAt");

-- CreateIndex
CREATE INDEX "Measurement_circuitId_takenAt_idx" ON "Measurement"("circuitId", "takenAt");

-- AddForeignKey
ALTER TABLE "User" ADD CONSTRAINT "User_shopId_fkey" FOREIGN KEY ("shopId") REFERENCES "Shop"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Vehicle" ADD CONSTRAINT "Vehicle_shopId_fkey" FOREIGN KEY ("shopId") REFERENCES "Shop"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Vehicle" ADD CONSTRAINT "Vehicle_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RepairOrder" ADD CONSTRAINT "RepairOrder_shopId_fkey" FOREIGN KEY ("shopId") REFERENCES "Shop"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RepairOrder" ADD CONSTRAINT "RepairOrder_vehicleId_fkey" FOREIGN KEY ("vehicleId") REFERENCES "Vehicle"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RepairOrder" ADD CONSTRAINT "RepairOrder_technicianId_fkey" FOREIGN KEY ("technicianId") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RepairOrder" ADD CONSTRAINT "RepairOrder_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "StatusChange" ADD CONSTRAINT "StatusChange_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "StatusChange" ADD CONSTRAINT "StatusChange_byId_fkey" FOREIGN KEY ("byId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Circuit" ADD CONSTRAINT "Circuit_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Circuit" ADD CONSTRAINT "Circuit_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Measurement" ADD CONSTRAINT "Measurement_repairOrderId_fkey" FOREIGN KEY ("repairOrderId") REFERENCES "RepairOrder"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Measurement" ADD CONSTRAINT "Measurement_circuitId_fkey" FOREIGN KEY ("circuitId") REFERENCES "Circuit"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Measurement" ADD CONSTRAINT "Measurement_supersedesId_fkey" FOREIGN KEY ("supersedesId") REFERENCES "Measurement"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Measurement" ADD CONSTRAINT "Measurement_takenById_fkey" FOREIGN KEY ("takenById") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- An over-range reading has no value; every other reading has both.
ALTER TABLE "Measurement" ADD CONSTRAINT "Measurement_value_or_overload" CHECK (
    ("overload" AND "valueEntered" IS NULL AND "valueSi" IS NULL)
    OR (NOT "overload" AND "valueEntered" IS NOT NULL AND "valueSi" IS NOT NULL)
);

-- Readings and status history are evidence: never changed in place, never deleted.
CREATE FUNCTION "tracebay_refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION 'table "%" is append-only: % is not allowed', TG_TABLE_NAME, TG_OP
        USING ERRCODE = 'insufficient_privilege';
END;
$$;

CREATE TRIGGER "Measurement_append_only" BEFORE UPDATE OR DELETE ON "Measurement"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();

CREATE TRIGGER "StatusChange_append_only" BEFORE UPDATE OR DELETE ON "StatusChange"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();
