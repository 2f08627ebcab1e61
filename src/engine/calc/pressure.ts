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

/**
 * Key on, engine off, the intake manifold is open to the air: MAP (SAE J1979 PID 0B) and BARO (PID 33) read the
 * same pressure. Agreement within 5 kPa is common practice (no source): two one-kilopascal displays and two
 * sensors' tolerances. A MAP sensor that reads in range but off shows here and nowhere else key on.
 */
export const MAP_BARO_AGREE_KPA = 5;

export interface MapBaroCheck {
  /** MAP − BARO, kPa. */
  differenceKpa: number;
  verdict: 'agree' | 'map_high' | 'map_low';
  /** Set when they disagree: a coded warning naming the MAP sensor or its circuit. */
  finding?: Finding;
}

export function mapAgainstBaroKoeo(mapKpa: number, baroKpa: number, agreeKpa = MAP_BARO_AGREE_KPA): Result<MapBaroCheck> {
  const found = [...checkFinite(mapKpa, 'mapKpa', 'MAP'), ...checkFinite(baroKpa, 'baroKpa', 'Barometric pressure'), ...checkFinite(agreeKpa, 'agreeKpa', 'Agreement band')];
  if (!found.length && baroKpa <= 0) found.push(finding('pressure.baro_not_positive', 'baroKpa', 'Barometric pressure must be positive.'));
  if (!found.length && !(agreeKpa > 0)) found.push(finding('pressure.band_not_positive', 'agreeKpa', 'The agreement band must be positive.'));
  if (found.length) return { ok: false, findings: found };
  const differenceKpa = mapKpa - baroKpa;
  if (Math.abs(differenceKpa) <= agreeKpa) return { ok: true, value: { differenceKpa, verdict: 'agree' } };
  const verdict = differenceKpa > 0 ? 'map_high' : 'map_low';
  const words = `MAP reads ${Math.abs(differenceKpa).toFixed(0)} kPa ${differenceKpa > 0 ? 'above' : 'below'} barometric pressure key on, engine off (they agree within ${agreeKpa} kPa on a sound sensor)`;
  return { ok: true, value: { differenceKpa, verdict, finding: finding(`pressure.map_baro_${verdict}`, 'mapKpa', `${words}: check the MAP sensor's reference, signal and ground, then the sensor itself.`) } };
}
