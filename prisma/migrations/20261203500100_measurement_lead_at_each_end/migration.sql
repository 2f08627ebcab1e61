-- AlterTable
ALTER TABLE "Measurement" ADD COLUMN     "againstLocation" "ProbeLocation",
ADD COLUMN     "otherConnector" "ConnectorState";
