-- AlterEnum
ALTER TYPE "ProbeLocation" ADD VALUE 'sensor_pins';
