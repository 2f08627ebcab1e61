/**
 * The 5 V reference under load and voltage-drop verdicts. Limits are common practice, no published source:
 * reference 5.00 ± 0.10 V, sensor-ground drop at most 0.1 V, a released regulator recovering to 4.8 V or more.
 */
import { checkFinite, finding, type Finding, type Result } from './findings';
import { sourceOhmsFromLoadedReading } from './meter-loading';

export interface ReferenceLimits {
  nominalVolts: number;
  toleranceVolts: number;
  /** A regulator released from a hard load must come back to at least this, V. */
  recoveryVolts: number;
}

export const DEFAULT_REFERENCE_LIMITS: ReferenceLimits = { nominalVolts: 5.0, toleranceVolts: 0.1, recoveryVolts: 4.8 };
export const DEFAULT_GROUND_DROP_LIMIT_VOLTS = 0.1;

export type ReferenceRecovery = 'healthy' | 'shorted_or_weak';

export interface ReferenceUnderLoad {
  /** Thevenin resistance of the reference from the loaded reading, Ω. */
  sourceOhms: number;
  /** When the released reading was given: whether it came back to the recovery limit. */
  recovery?: ReferenceRecovery;
}

/**
 * Reference source resistance from a reading under a known load: R = R_load·(V_open/V_loaded − 1); and, given the
 * reading after releasing the load, whether the regulator recovers (healthy) or stays down (shorted or weak).
 */
export function referenceUnderLoad(
  input: { openVolts: number; loadedVolts: number; loadOhms: number; releasedVolts?: number },
  limits: ReferenceLimits = DEFAULT_REFERENCE_LIMITS,
): Result<ReferenceUnderLoad> {
  const source = sourceOhmsFromLoadedReading({ openVolts: input?.openVolts, readVolts: input?.loadedVolts, loadOhms: input?.loadOhms });
  if (!source.ok) {
    const renamed = source.findings.map((f) => (f.path === 'readVolts' ? { ...f, path: 'loadedVolts' } : f));
    return { ok: false, findings: renamed };
  }
  if (input.releasedVolts === undefined) return { ok: true, value: { sourceOhms: source.value } };
  const found = checkFinite(input.releasedVolts, 'releasedVolts', 'Reading after release');
  if (found.length) return { ok: false, findings: found };
  const recovery: ReferenceRecovery = input.releasedVolts >= limits.recoveryVolts ? 'healthy' : 'shorted_or_weak';
  return { ok: true, value: { sourceOhms: source.value, recovery } };
}

export type Verdict = 'pass' | 'low' | 'high';

/** Reference voltage against nominal ± tolerance. */
export function referenceVerdict(volts: number, limits: ReferenceLimits = DEFAULT_REFERENCE_LIMITS): Result<Verdict> {
  const found = [...checkFinite(volts, 'volts', 'Reference voltage'), ...checkLimits(limits)];
  if (found.length) return { ok: false, findings: found };
  if (volts < limits.nominalVolts - limits.toleranceVolts) return { ok: true, value: 'low' };
  if (volts > limits.nominalVolts + limits.toleranceVolts) return { ok: true, value: 'high' };
  return { ok: true, value: 'pass' };
}

/** Voltage drop along a sensor ground (or any wire carrying current): pass when |drop| ≤ limit. */
export function voltageDropVerdict(dropVolts: number, limitVolts = DEFAULT_GROUND_DROP_LIMIT_VOLTS): Result<'pass' | 'excessive'> {
  const found = [...checkFinite(dropVolts, 'dropVolts', 'Voltage drop'), ...checkFinite(limitVolts, 'limitVolts', 'Drop limit')];
  if (!found.length && limitVolts <= 0) found.push(finding('drop.limit_not_positive', 'limitVolts', 'The drop limit must be positive.'));
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: Math.abs(dropVolts) <= limitVolts ? 'pass' : 'excessive' };
}

/** Resistance a drop reveals at a known current (Ohm's law), for reporting a high-resistance finding. */
export function resistanceFromDrop(dropVolts: number, amps: number): Result<number> {
  const found = [...checkFinite(dropVolts, 'dropVolts', 'Voltage drop'), ...checkFinite(amps, 'amps', 'Current')];
  if (!found.length && amps === 0) found.push(finding('drop.zero_current', 'amps', 'A drop says nothing about resistance without current.'));
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: Math.abs(dropVolts / amps) };
}

function checkLimits(limits: ReferenceLimits): Finding[] {
  const found = [
    ...checkFinite(limits?.nominalVolts, 'limits.nominalVolts', 'Nominal reference'),
    ...checkFinite(limits?.toleranceVolts, 'limits.toleranceVolts', 'Reference tolerance'),
  ];
  if (!found.length && limits.toleranceVolts < 0) found.push(finding('reference.negative_tolerance', 'limits.toleranceVolts', 'The tolerance must not be negative.'));
  return found;
}
