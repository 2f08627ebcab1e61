/**
 * Wire identification without a diagram, as inference over joint role assignments: every assignment of roles to
 * cavities (each role at most once, `not_identified` any number of times) is scored by the product of the cavities'
 * likelihoods, marginalised over the regulator voltage they share, times a prior; scores are normalised.
 */
import { CIRCUIT_KINDS, type CircuitKind } from '../vocabulary';
import { checkFinite, checkResistance, describe, finding, joinPath, type Finding, type Result } from '../calc/findings';
import { ROLE_BEHAVIOURS, ROLES, type CavityReadings, type Role } from './roles';
import { reasonFor } from './reasons';
import { planNextReading, type NextReading } from './next-reading';

export const MAX_CAVITIES = 8;
/** Regulator voltage grid shared by all cavities: 4.85–5.15 V (a 5.00 ± 0.10 V reference with margin). */
export const VREG_GRID = Array.from({ length: 31 }, (_, i) => 4.85 + i * 0.01);

export interface IdentifyInput {
  cavities: CavityReadings[];
  /** Which connector this is; by default two cavities mean a thermistor, more a three-wire 5 V sensor. */
  circuitKind?: CircuitKind;
}

export interface CavityVerdict {
  cavity: string;
  /** Role in the most probable joint assignment. */
  role: Role;
  /** Marginal probability of each role for this cavity. */
  probabilities: Record<Role, number>;
  reason: string;
}

export interface Identification {
  circuitKind: CircuitKind;
  cavities: CavityVerdict[];
  /** Probability of the most probable joint assignment. */
  assignmentProbability: number;
  /** The reading that would settle most doubt, absent when the assignment is settled. */
  next?: NextReading;
}

/** A scored joint assignment: roles by cavity index and normalised probability. */
export interface ScoredAssignment {
  roles: Role[];
  probability: number;
}

function validate(input: IdentifyInput): Finding[] {
  if (!input || !Array.isArray(input.cavities)) return [finding('wires.cavities_not_a_list', 'cavities', 'Cavities must be a list.')];
  const found: Finding[] = [];
  if (input.circuitKind !== undefined && !CIRCUIT_KINDS.includes(input.circuitKind)) {
    found.push(finding('wires.unknown_circuit_kind', 'circuitKind', `Expected one of ${CIRCUIT_KINDS.join(', ')}, got ${describe(input.circuitKind)}.`));
  }
  if (input.cavities.length < 1 || input.cavities.length > MAX_CAVITIES) {
    found.push(finding('wires.cavity_count', 'cavities', `Between 1 and ${MAX_CAVITIES} cavities are needed, got ${input.cavities.length}.`));
  }
  const names = new Set<string>();
  input.cavities.forEach((c, i) => {
    const at = joinPath('cavities', i);
    if (typeof c?.cavity !== 'string' || c.cavity.trim() === '') found.push(finding('wires.missing_cavity_name', joinPath(at, 'cavity'), 'Each cavity needs a name.'));
    else if (names.has(c.cavity)) found.push(finding('wires.duplicate_cavity', joinPath(at, 'cavity'), `Cavity ${describe(c.cavity)} appears twice.`));
    names.add(c?.cavity);
    if (c?.volts !== undefined) found.push(...checkFinite(c.volts, joinPath(at, 'volts'), 'Volts'));
    if (c?.meterOhms !== undefined) found.push(...checkResistance(c.meterOhms, joinPath(at, 'meterOhms'), 'Meter input resistance', true));
    if (c?.ohms !== undefined && c.ohms !== 'open') found.push(...checkResistance(c.ohms, joinPath(at, 'ohms'), 'Ohms reading'));
    if (c?.loaded !== undefined) {
      found.push(...checkFinite(c.loaded?.volts, joinPath(at, 'loaded', 'volts'), 'Loaded volts'));
      if (c.loaded?.meterOhms !== undefined) found.push(...checkResistance(c.loaded.meterOhms, joinPath(at, 'loaded', 'meterOhms'), 'Meter input resistance', true));
      if (c.loaded?.parallelOhms !== undefined) found.push(...checkResistance(c.loaded.parallelOhms, joinPath(at, 'loaded', 'parallelOhms'), 'Parallel resistor', true));
      if (c.loaded?.meterOhms === undefined && c.loaded?.parallelOhms === undefined) {
        found.push(finding('wires.loaded_without_load', joinPath(at, 'loaded'), 'A second reading needs its meter input resistance or the resistor put in parallel.'));
      }
    }
  });
  return found;
}

/** likelihood[c][r][v]: cavity c, role index r, regulator grid point v. */
export function likelihoodTable(cavities: CavityReadings[], roles: Role[], kind: CircuitKind): number[][][] {
  return cavities.map((c) => roles.map((r) => VREG_GRID.map((v) => ROLE_BEHAVIOURS[r].likelihood(c, v, kind))));
}

/** All valid joint assignments (role indices per cavity), each single role used at most once. */
export function enumerateAssignments(cavityCount: number, roles: Role[]): number[][] {
  const out: number[][] = [];
  const current: number[] = [];
  const used = new Set<number>();
  const walk = (c: number) => {
    if (c === cavityCount) return void out.push([...current]);
    roles.forEach((role, r) => {
      const single = role !== 'not_identified';
      if (single && used.has(r)) return;
      current.push(r);
      if (single) used.add(r);
      walk(c + 1);
      current.pop();
      if (single) used.delete(r);
    });
  };
  walk(0);
  return out;
}

/** Roles every connector of a kind should show; an assignment missing one is less likely a priori. */
const ESSENTIAL_ROLES: Record<CircuitKind, Role[]> = {
  three_wire_5v: ['reference', 'ground'],
  two_wire_thermistor: ['signal_pull_up', 'ground'],
};
const MISSING_ESSENTIAL_FACTOR = 0.3;

/** Normalised posterior over joint assignments. */
export function scoreAssignments(table: number[][][], roles: Role[], assignments: number[][], kind: CircuitKind): ScoredAssignment[] {
  const essential = ESSENTIAL_ROLES[kind].map((r) => roles.indexOf(r));
  const scores = assignments.map((a) => {
    let prior = a.reduce((p, r) => p * ROLE_BEHAVIOURS[roles[r]!].prior, 1);
    for (const e of essential) if (!a.includes(e)) prior *= MISSING_ESSENTIAL_FACTOR;
    let sum = 0;
    for (let v = 0; v < VREG_GRID.length; v++) {
      let product = 1;
      for (let c = 0; c < a.length; c++) product *= table[c]![a[c]!]![v]!;
      sum += product;
    }
    return (prior * sum) / VREG_GRID.length;
  });
  const total = scores.reduce((s, x) => s + x, 0);
  return assignments
    .map((a, i) => ({ roles: a.map((r) => roles[r]!), probability: total > 0 ? scores[i]! / total : 1 / assignments.length }))
    .sort((x, y) => y.probability - x.probability);
}

/** The most probable role for each cavity, with marginals, a reason and the next reading to take. */
export function identifyWires(input: IdentifyInput): Result<Identification> {
  const found = validate(input);
  if (found.length) return { ok: false, findings: found };
  const kind: CircuitKind = input.circuitKind ?? (input.cavities.length === 2 ? 'two_wire_thermistor' : 'three_wire_5v');
  const roles = ROLES.filter((r) => ROLE_BEHAVIOURS[r].appliesTo(kind));
  const table = likelihoodTable(input.cavities, roles, kind);
  const posterior = scoreAssignments(table, roles, enumerateAssignments(input.cavities.length, roles), kind);
  const best = posterior[0]!;
  const marginals = input.cavities.map((_, c) => {
    const p = Object.fromEntries(ROLES.map((r) => [r, 0])) as Record<Role, number>;
    for (const a of posterior) p[a.roles[c]!] += a.probability;
    return p;
  });
  const vreg = referenceVolts(input.cavities, best.roles);
  const cavities = input.cavities.map((c, i) => ({
    cavity: c.cavity,
    role: best.roles[i]!,
    probabilities: marginals[i]!,
    reason: reasonFor(best.roles[i]!, c, vreg),
  }));
  const next = planNextReading(input.cavities, roles, posterior, kind);
  return { ok: true, value: { circuitKind: kind, cavities, assignmentProbability: best.probability, ...(next ? { next } : {}) } };
}

/** The reference's own reading when a cavity is assigned to it, else the nominal 5.00 V. */
function referenceVolts(cavities: CavityReadings[], roles: Role[]): number {
  const i = roles.indexOf('reference');
  const v = i >= 0 ? cavities[i]!.volts : undefined;
  return v !== undefined && v > 4 ? v : 5.0;
}
