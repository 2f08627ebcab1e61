/**
 * Fault-tree documents of any size, valid in every other respect: for the size limits and for trees heavy enough to
 * test that a diagnosis cannot hold up the service. Outcomes are 1 V wide ranges with 0.1 V guard bands; each cause
 * favours one outcome of each test (invented numbers, not a circuit).
 */
import { TREE_FORMAT } from '../../src/engine/diagnosis';

const POINTS = ['reference', 'signal', 'ground', 'battery_negative', 'battery_positive', 'chassis_ground'] as const;
const PLACES = ['sensor_connector', 'module_connector'] as const;
const CONNECTORS = ['plugged', 'unplugged', 'backprobed'] as const;

/** The n-th distinct meter request (up to 180). */
export function nthRequest(n: number) {
  const pairs = POINTS.flatMap((at) => POINTS.filter((b) => b !== at).map((against) => ({ at, against })));
  const pair = pairs[n % pairs.length]!;
  const rest = Math.floor(n / pairs.length);
  return { quantity: 'dc_volts', ...pair, location: PLACES[rest % 2]!, connector: CONNECTORS[Math.floor(rest / 2) % 3]!, key: 'on', engine: 'off', jumpers: [] };
}

export interface SyntheticSize {
  tests: number;
  outcomes: number;
  /** Causes besides the "unknown" one. */
  causes: number;
  setups?: number;
  id?: string;
  /** Each cause's likelihood row names only the outcome it favours (the rest is floored on load): a small document. */
  sparse?: boolean;
}

export function syntheticTree(size: SyntheticSize): Record<string, unknown> {
  const causes = Array.from({ length: size.causes }, (_, i) => ({ id: `c${i}`, label: `Cause ${i}`, prior: 1, repair: { part: 'signal', action: `Repair ${i}` } }));
  const setups = Array.from({ length: size.setups ?? 0 }, (_, i) => ({ id: `s${i}`, label: `Set-up ${i}`, minutes: 1, steps: [`Step ${i}`] }));
  const tests = Array.from({ length: size.tests }, (_, t) => {
    const outcomes = Array.from({ length: size.outcomes }, (_, o) => ({ id: `o${o}`, label: `Outcome ${o}`, condition: { fact: 'value', operator: 'inRange', value: [o, o + 0.9] } }));
    const likelihoods = Object.fromEntries(
      causes.map((c, ci) => [
        c.id,
        size.sparse
          ? { [`o${(ci + t) % size.outcomes}`]: 1 }
          : Object.fromEntries(outcomes.map((o, oi) => [o.id, oi === (ci + t) % size.outcomes ? 0.9 : 0.1 / Math.max(1, size.outcomes - 1)])),
      ]),
    );
    return { id: `t${t}`, label: `Test ${t}`, procedure: ['Measure.'], request: nthRequest(t), minutes: 2, setups: setups.length ? [setups[t % setups.length]!.id] : [], outcomes, likelihoods };
  });
  return {
    format: TREE_FORMAT,
    id: size.id ?? 'synthetic',
    version: `${size.tests}x${size.outcomes}x${size.causes}`,
    circuitKind: 'three_wire_5v',
    title: `Synthetic ${size.tests} tests × ${size.outcomes} outcomes × ${size.causes} causes`,
    hypotheses: [...causes, { id: 'unknown', label: 'Not modelled', prior: 0.5, unknown: true, repair: { part: 'sensor', action: 'Look further' } }],
    setups,
    tests,
  };
}
