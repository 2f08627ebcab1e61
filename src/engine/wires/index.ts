/**
 * Wire identification at an unplugged sensor connector without a diagram: readings per cavity in, the most
 * probable role assignment with per-cavity probabilities, a reason per cavity and the next reading to take out.
 */
export { identifyWires, enumerateAssignments, likelihoodTable, scoreAssignments, MAX_CAVITIES, VREG_GRID } from './identify';
export type { IdentifyInput, Identification, CavityVerdict, ScoredAssignment } from './identify';
export { ROLES, ROLE_BEHAVIOURS, DEFAULT_METER_INPUT_OHMS, type Role, type CavityReadings, type RoleBehaviour } from './roles';
export { planNextReading, PROBE_RESISTOR_OHMS, type NextReading, type NextReadingKind } from './next-reading';
export { type Finding } from '../calc/findings';
