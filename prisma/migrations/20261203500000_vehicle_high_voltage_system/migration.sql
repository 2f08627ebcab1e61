-- AlterTable
ALTER TABLE "Vehicle" ADD COLUMN     "highVoltageSystem" BOOLEAN NOT NULL DEFAULT false;
