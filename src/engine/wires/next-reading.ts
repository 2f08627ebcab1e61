/**
 * The next reading that would best settle the assignment: for each reading not yet taken on each cavity, the
 * expected drop in entropy (bits) of the joint assignment, with outcomes drawn from the roles' noise-free
 * predictions at the nominal 5.00 V reference (an approximation: one outcome per part-value grid point).
 */
import type { CircuitKind } from '../vocabulary';
import { ROLE_BEHAVIOURS, loadOf, predictedReadings, type CavityReadings, type Role } from './roles';
import type { ScoredAssignment } from './identify';

export type NextReadingKind = 'dc_volts_key_on' | 'ohms_key_off' | 'dc_volts_with_parallel_resistor';

export interface NextReading {
  cavity: string;
  kind: NextReadingKind;
  /** For `dc_volts_with_parallel_resistor`: the resistor to put across the meter leads, Ω. */
  parallelOhms?: number;
  /** Expected information gain on the role assignment, bits. */
  expectedBits: number;
  instruction: string;
}

/** A known load that tells a stiff reference from a biased signal: a biased input falls to ~4 V, a reference holds. */
export const PROBE_RESISTOR_OHMS = 1e6;
const NOMINAL_VREG = 5.0;
const SETTLED_PROBABILITY = 0.99;
const MIN_USEFUL_BITS = 0.02;

interface Candidate {
  kind: NextReadingKind;
  missing(c: CavityReadings): boolean;
  /** The readings object holding just this outcome, from a role scenario's prediction. */
  outcome(prediction: (load: number) => { volts: number; ohms: number | 'open' }): CavityReadings;
  instruction(cavity: string): string;
}

const CANDIDATES: Candidate[] = [
  {
    kind: 'dc_volts_key_on',
    missing: (c) => c.volts === undefined,
    outcome: (p) => ({ cavity: '', volts: p(loadOf(undefined, undefined)).volts }),
    instruction: (cavity) => `Key on, connector unplugged: read volts from cavity ${cavity} to battery negative.`,
  },
  {
    kind: 'ohms_key_off',
    missing: (c) => c.ohms === undefined,
    outcome: (p) => ({ cavity: '', ohms: p(loadOf(undefined, undefined)).ohms }),
    instruction: (cavity) => `Key off, connector unplugged: read ohms from cavity ${cavity} to battery negative (never an ohmmeter on airbag circuits).`,
  },
  {
    kind: 'dc_volts_with_parallel_resistor',
    missing: (c) => c.loaded === undefined,
    outcome: (p) => ({ cavity: '', loaded: { volts: p(loadOf(undefined, PROBE_RESISTOR_OHMS)).volts, parallelOhms: PROBE_RESISTOR_OHMS } }),
    instruction: (cavity) =>
      `Key on, connector unplugged: read volts from cavity ${cavity} to battery negative with a 1 MΩ resistor across the meter leads; a reference holds near 5 V, a biased signal falls to about 4 V.`,
  },
];

function entropyBits(ps: number[]): number {
  let h = 0;
  for (const p of ps) if (p > 0) h -= p * Math.log2(p);
  return h;
}

function expectedEntropy(cavityIndex: number, candidate: Candidate, roles: Role[], posterior: ScoredAssignment[], kind: CircuitKind, h0: number): number {
  const marginal = new Map<Role, number>();
  for (const a of posterior) marginal.set(a.roles[cavityIndex]!, (marginal.get(a.roles[cavityIndex]!) ?? 0) + a.probability);
  let expected = 0;
  for (const [role, mass] of marginal) {
    const scenarios = ROLE_BEHAVIOURS[role].scenarios(kind);
    if (scenarios.length === 0) {
      expected += mass * h0; // an unidentified cavity's outcome is not predicted: no gain counted
      continue;
    }
    const totalWeight = scenarios.reduce((s, x) => s + x.weight, 0);
    for (const s of scenarios) {
      const readings = candidate.outcome((load) => predictedReadings(s, NOMINAL_VREG, load));
      const byRole = new Map(roles.map((r) => [r, ROLE_BEHAVIOURS[r].likelihood(readings, NOMINAL_VREG, kind)]));
      const updated = posterior.map((a) => a.probability * byRole.get(a.roles[cavityIndex]!)!);
      const z = updated.reduce((x, y) => x + y, 0);
      expected += mass * (s.weight / totalWeight) * (z > 0 ? entropyBits(updated.map((u) => u / z)) : h0);
    }
  }
  return expected;
}

/** The most informative reading not yet taken, or undefined when every cavity is settled. */
export function planNextReading(cavities: CavityReadings[], roles: Role[], posterior: ScoredAssignment[], kind: CircuitKind): NextReading | undefined {
  // Assignments carrying almost no mass cannot change the answer; dropping them keeps planning fast.
  const kept: ScoredAssignment[] = [];
  let mass = 0;
  for (const a of posterior) {
    if (mass > 0.9999 || kept.length >= 200) break;
    kept.push(a);
    mass += a.probability;
  }
  const normalised = kept.map((a) => ({ ...a, probability: a.probability / mass }));
  const settled = cavities.every((_, c) => {
    const top = new Map<Role, number>();
    for (const a of normalised) top.set(a.roles[c]!, (top.get(a.roles[c]!) ?? 0) + a.probability);
    return Math.max(...top.values()) >= SETTLED_PROBABILITY;
  });
  if (settled) return undefined;
  const h0 = entropyBits(normalised.map((a) => a.probability));
  let best: NextReading | undefined;
  cavities.forEach((c, i) => {
    for (const candidate of CANDIDATES) {
      if (!candidate.missing(c)) continue;
      const gain = h0 - expectedEntropy(i, candidate, roles, normalised, kind, h0);
      if (gain >= MIN_USEFUL_BITS && (!best || gain > best.expectedBits)) {
        best = {
          cavity: c.cavity,
          kind: candidate.kind,
          ...(candidate.kind === 'dc_volts_with_parallel_resistor' ? { parallelOhms: PROBE_RESISTOR_OHMS } : {}),
          expectedBits: gain,
          instruction: candidate.instruction(c.cavity),
        };
      }
    }
  });
  return best;
}
