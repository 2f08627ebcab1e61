/**
 * What is worth a second look about the vehicle of a new order, without refusing it: the model year typed against
 * the VIN's tenth character (49 CFR 565.15(c): position 10 codes the model year), and a VIN already on file with
 * another model year (the order then uses the vehicle on file, and says so).
 */
import { checkVin } from '../../engine/vin';
import type { Finding } from '../../common/errors/domain.exception';

export interface VehicleOnFile {
  year: number;
  make: string;
  model: string;
}

export function vehicleWarnings(
  typed: { vin: string; year: number; builtOutsideNorthAmerica: boolean },
  onFile: VehicleOnFile | null,
  path = 'body.vehicle.year',
): Finding[] {
  const out: Finding[] = [];
  const checked = checkVin(typed.vin, { outsideNorthAmerica: typed.builtOutsideNorthAmerica });
  if (checked.ok && checked.modelYearCandidates && !checked.modelYearCandidates.includes(typed.year)) {
    out.push({
      code: 'vehicle.year_not_vin_year',
      path,
      message: `the VIN's 10th character "${checked.modelYearCode}" stands for model year ${checked.modelYearCandidates.join(' or ')}, not ${typed.year}: check the year or the VIN`,
    });
  }
  if (onFile && onFile.year !== typed.year) {
    out.push({
      code: 'vehicle.on_file_year_differs',
      path,
      message: `this VIN is already on file as a ${onFile.year} ${onFile.make} ${onFile.model}; the order uses the vehicle on file, not ${typed.year}`,
    });
  }
  return out;
}
