/**
 * Linear pressure sensors and vacuum/absolute conversion.
 *
 * The inch of mercury constant is kept here privately until the shared unit module exists:
 * 1 inHg (conventional) = 3386.389 Pa (NIST SP 811, appendix B).
 */
import { checkFinite, finding, joinPath, type Finding, type Result } from './findings';

const PASCALS_PER_INHG = 3386.389;

export interface CalibrationPoint {
  volts: number;
  kpa: number;
}

export interface LinearSensor {
  /** Pressure (kPa) for an output voltage. */
  kpaAt(volts: number): number;
  /** Output voltage for a pressure (kPa). */
  voltsAt(kpa: number): number;
  /** Slope, V per kPa. */
  voltsPerKpa: number;
}

/** The straight line through two calibration points. */
export function linearSensor(points: [CalibrationPoint, CalibrationPoint]): Result<LinearSensor> {
  const found: Finding[] = [];
  if (!Array.isArray(points) || points.length !== 2) {
    return { ok: false, findings: [finding('pressure.two_points_needed', 'points', 'Exactly two calibration points are needed.')] };
  }
  points.forEach((p, i) => {
    found.push(...checkFinite(p?.volts, joinPath('points', i, 'volts'), 'Calibration voltage'));
    found.push(...checkFinite(p?.kpa, joinPath('points', i, 'kpa'), 'Calibration pressure'));
  });
  if (found.length) return { ok: false, findings: found };
  const [p1, p2] = points;
  if (p1.kpa === p2.kpa || p1.volts === p2.volts) {
    return { ok: false, findings: [finding('pressure.points_coincide', 'points[1]', 'The two calibration points need different pressures and voltages.')] };
  }
  const slope = (p2.volts - p1.volts) / (p2.kpa - p1.kpa);
  return {
    ok: true,
    value: {
      voltsPerKpa: slope,
      voltsAt: (kpa) => p1.volts + (kpa - p1.kpa) * slope,
      kpaAt: (volts) => p1.kpa + (volts - p1.volts) / slope,
    },
  };
}

function checkPressures(vacuum: number, baro: number, vacuumPath: string): Finding[] {
  const found = [...checkFinite(vacuum, vacuumPath, 'Vacuum'), ...checkFinite(baro, 'baroKpa', 'Barometric pressure')];
  if (!found.length && baro <= 0) found.push(finding('pressure.baro_not_positive', 'baroKpa', 'Barometric pressure must be positive.'));
  return found;
}

/** Absolute pressure (kPa) of a gauge vacuum in inHg under a barometer in kPa: p_abs = p_baro − vacuum. */
export function vacuumInHgToAbsoluteKpa(vacuumInHg: number, baroKpa: number): Result<number> {
  const found = checkPressures(vacuumInHg, baroKpa, 'vacuumInHg');
  if (found.length) return { ok: false, findings: found };
  const absolute = baroKpa - (vacuumInHg * PASCALS_PER_INHG) / 1000;
  if (absolute < 0) {
    return { ok: false, findings: [finding('pressure.vacuum_exceeds_baro', 'vacuumInHg', `${vacuumInHg} inHg of vacuum is more than the barometric pressure of ${baroKpa} kPa.`)] };
  }
  return { ok: true, value: absolute };
}

/** Gauge vacuum (inHg) of an absolute pressure (kPa) under a barometer in kPa. */
export function absoluteKpaToVacuumInHg(absoluteKpa: number, baroKpa: number): Result<number> {
  const found = checkPressures(absoluteKpa, baroKpa, 'absoluteKpa');
  if (!found.length && absoluteKpa < 0) found.push(finding('pressure.negative_absolute', 'absoluteKpa', 'Absolute pressure must not be negative.'));
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: ((baroKpa - absoluteKpa) * 1000) / PASCALS_PER_INHG };
}
