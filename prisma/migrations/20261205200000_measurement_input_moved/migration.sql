-- CreateEnum
CREATE TYPE "SensorInput" AS ENUM ('at_rest', 'moved');

-- AlterTable
ALTER TABLE "Measurement" ADD COLUMN     "sensorInput" "SensorInput";
