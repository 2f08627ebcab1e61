/**
 * The jumper safety rule, one place for tree validation and test choice alike:
 *
 * - no jumper test is proposed until every wire it joins has read at most 5.5 V key on (a DC volts reading of
 *   that wire against battery negative or chassis ground, at the connector where the jumper goes). Battery voltage
 *   on a 5 V reference or on a signal input can destroy the module;
 * - a fused jumper (or any path under 1 kΩ) between the 5 V reference and ground is never proposed: it shorts the
 *   module's supply. A load resistor of 1 kΩ or more (a supply load test) may be;
 * - a jumper's bench source above 5.5 V is never proposed.
 *
 * Both limits are common practice, no source.
 */
import type { Jumper, Location, MeasurementRequest, Point } from '../vocabulary';
import { finding, joinPath, type Finding } from './findings';
import type { CheckedReading } from './reading-checks';
import type { TestDocument, TreeDocument } from './tree-schema';
import type { Test, Tree } from './tree-model';

/** Highest voltage a wire may show, key on, before a jumper joins it (a 5 V input tolerates this). */
export const JUMPER_SAFE_VOLTS = 5.5;
/** Smallest resistance that may join the 5 V reference to ground (5 mA at 5 V). */
export const MIN_REFERENCE_LOAD_OHMS = 1000;

/** A wire that must have read at most `atMostVolts` (key on) before the test is proposed. */
export interface VoltsRequirement {
  measured: Point;
  atMostVolts: number;
}

/** Fixed ground points: 0 V by definition, never the danger. */
const GROUNDS: ReadonlySet<Point> = new Set<Point>(['battery_negative', 'chassis_ground']);
const GROUND_LIKE: ReadonlySet<Point> = new Set<Point>(['battery_negative', 'chassis_ground', 'ground']);

/** The wires a request's jumpers join (fixed grounds excluded), each once. */
export function joinedWires(request: Pick<MeasurementRequest, 'jumpers'>): Point[] {
  return [...new Set(request.jumpers.flatMap((j) => [j.from, j.to]).filter((p) => !GROUNDS.has(p)))];
}

/** The requirements the rule implies for a request: every joined wire at most 5.5 V. */
export function impliedRequirements(request: Pick<MeasurementRequest, 'jumpers'>): VoltsRequirement[] {
  return joinedWires(request).map((measured) => ({ measured, atMostVolts: JUMPER_SAFE_VOLTS }));
}

/** Why a jumper must never be fitted at all, or undefined when it may be (once its wires are measured). */
export function jumperHazard(jumper: Jumper): { code: string; message: string } | undefined {
  const ends = [jumper.from, jumper.to];
  const via = jumper.via;
  if (ends.includes('battery_positive'))
    return { code: 'jumper_battery_positive', message: 'a jumper from battery positive puts battery voltage on the circuit: never on a 5 V sensor circuit' };
  if (via.kind === 'voltage_source' && Math.abs(via.volts) > JUMPER_SAFE_VOLTS)
    return { code: 'jumper_source_over_limit', message: `a bench source of ${via.volts} V is above the ${JUMPER_SAFE_VOLTS} V a 5 V input tolerates` };
  const referenceToGround = ends.includes('reference') && ends.some((p) => GROUND_LIKE.has(p));
  if (referenceToGround && !(via.kind === 'resistor' && via.ohms >= MIN_REFERENCE_LOAD_OHMS))
    return {
      code: 'jumper_reference_to_ground',
      message: `a ${via.kind === 'resistor' ? `${via.ohms} Ω resistor` : via.kind.replace('_', ' ')} between the 5 V reference and ground shorts the module's supply; only a load resistor of ${MIN_REFERENCE_LOAD_OHMS} Ω or more may join them`,
    };
  return undefined;
}

/** A key-on DC volts reading of one wire against a fixed ground, no jumpers fitted, at `location`. */
function measuresWire(request: MeasurementRequest, wire: Point, location: Location): boolean {
  if (request.quantity !== 'dc_volts' || request.key !== 'on' || request.jumpers.length > 0 || request.location !== location) return false;
  return (request.at === wire && GROUNDS.has(request.against!)) || (request.against === wire && GROUNDS.has(request.at));
}

const words = (points: readonly string[]) => points.map((p) => p.replace(/_/g, ' ')).join(' and ');

/** Tree validation: every jumper test declares the requirements the rule implies, each measurable by a test of the tree. */
export function checkJumperSafety(doc: TreeDocument): Finding[] {
  return doc.tests.flatMap((t, i) => {
    const out: Finding[] = [];
    t.request.jumpers.forEach((j, k) => {
      const hazard = jumperHazard(j);
      if (hazard) out.push(finding(`tree.${hazard.code}`, joinPath('tests', i, 'request', 'jumpers', k), `test "${t.id}": ${hazard.message}`));
    });
    for (const need of impliedRequirements(t.request)) {
      const declared = (t.requires ?? []).find((r) => r.measured === need.measured);
      if (!declared)
        out.push(
          finding(
            'tree.jumper_precondition_missing',
            joinPath('tests', i, 'requires'),
            `test "${t.id}" joins the ${words([need.measured])} wire with a jumper: add {"measured": "${need.measured}", "atMostVolts": ${JUMPER_SAFE_VOLTS}} so it is proposed only after that wire read ${JUMPER_SAFE_VOLTS} V or less, key on`,
          ),
        );
      else if (declared.atMostVolts > JUMPER_SAFE_VOLTS)
        out.push(finding('tree.jumper_precondition_too_high', joinPath('tests', i, 'requires', t.requires!.indexOf(declared), 'atMostVolts'), `a jumper may join a wire only once it read ${JUMPER_SAFE_VOLTS} V or less, not ${declared.atMostVolts} V`));
    }
    (t.requires ?? []).forEach((r, k) => {
      if (!doc.tests.some((m) => measuresWire(m.request, r.measured, t.request.location)))
        out.push(
          finding(
            'tree.precondition_unmeasurable',
            joinPath('tests', i, 'requires', k),
            `no test of the tree measures the ${words([r.measured])} wire in DC volts, key on, against battery negative or chassis ground at the ${words([t.request.location])}: test "${t.id}" could never be proposed`,
          ),
        );
    });
    return out;
  });
}

/** The requirements the engine enforces for a test: those declared, and those the rule implies. */
export function requirementsOf(t: Pick<TestDocument, 'request' | 'requires'>): VoltsRequirement[] {
  const out = [...(t.requires ?? [])];
  for (const need of impliedRequirements(t.request)) {
    const i = out.findIndex((r) => r.measured === need.measured);
    if (i < 0) out.push(need);
    else out[i] = { measured: need.measured, atMostVolts: Math.min(out[i]!.atMostVolts, need.atMostVolts) };
  }
  return out;
}

/** The plain-words precondition a jumper test shows the technician. */
export function preconditionText(requires: readonly VoltsRequirement[], location: Location): string | undefined {
  if (requires.length === 0) return undefined;
  const limit = Math.min(...requires.map((r) => r.atMostVolts));
  return `Fit the jumper only after the ${words(requires.map((r) => r.measured))} ${requires.length > 1 ? 'wires have' : 'wire has'} read ${limit} V or less, key on, at the ${words([location])}: more would reach the module's 5 V input.`;
}

export interface JumperSafety {
  /** Tests not to be proposed now (held until their wires are measured, or never). */
  blocked: Set<number>;
  /** Blocked tests that no remaining test can clear: closed for planning too. */
  closed: Set<number>;
  findings: Finding[];
}

/**
 * Which tests may not be proposed given the readings so far. A wire is cleared by a key-on DC volts reading of it at
 * most the limit, taken after the last repair and not superseded; any such reading above the limit closes every
 * test that needs the wire. `done` marks tests already answered (≥ 0) or set aside (−2).
 */
export function jumperSafety(tree: Tree, readings: readonly CheckedReading[], repairs: ReadonlyArray<{ atMs: number }>, done: ArrayLike<number>): JumperSafety {
  const lastRepair = Math.max(-Infinity, ...repairs.map((r) => r.atMs));
  const live = readings.filter((r) => r.takenAtMs >= lastRepair && !(r.supersededBy && readings.some((q) => q.id === r.supersededBy)));
  const out: JumperSafety = { blocked: new Set(), closed: new Set(), findings: [] };
  for (const test of tree.tests) {
    if (test.requires.length === 0 && !test.request.jumpers.some((j) => jumperHazard(j))) continue;
    const hazard = test.request.jumpers.map(jumperHazard).find((h) => h);
    if (hazard) {
      out.blocked.add(test.index);
      out.closed.add(test.index);
      out.findings.push(finding('diagnosis.jumper_never_proposed', `tests[${test.index}]`, `"${test.label}" is never proposed: ${hazard.message}`, 'warning'));
      continue;
    }
    const state = test.requires.map((need) => wireState(tree, test, need, live, done));
    const high = state.find((s) => s.kind === 'high');
    if (high && high.kind === 'high') {
      out.blocked.add(test.index);
      out.closed.add(test.index);
      out.findings.push(
        finding('diagnosis.jumper_unsafe', `readings[${high.reading.inputIndex}]`, `the ${words([high.need.measured])} wire read ${high.reading.value} V key on (above ${high.need.atMostVolts} V): "${test.label}" is not proposed, it would put that voltage on the module's 5 V circuit`, 'warning'),
      );
    } else if (state.some((s) => s.kind !== 'cleared')) {
      out.blocked.add(test.index);
      if (state.some((s) => s.kind === 'unmeasurable')) out.closed.add(test.index);
    }
  }
  return out;
}

type WireState = { kind: 'cleared' } | { kind: 'high'; need: VoltsRequirement; reading: CheckedReading } | { kind: 'pending' } | { kind: 'unmeasurable' };

function wireState(tree: Tree, test: Test, need: VoltsRequirement, live: readonly CheckedReading[], done: ArrayLike<number>): WireState {
  const readings = live.filter((r) => measuresWire(r.request, need.measured, test.request.location));
  const high = readings.find((r) => Math.abs(r.value) > need.atMostVolts);
  if (high) return { kind: 'high', need, reading: high };
  if (readings.length > 0) return { kind: 'cleared' };
  const clearable = tree.tests.some((m) => done[m.index] === -1 && measuresWire(m.request, need.measured, test.request.location));
  return clearable ? { kind: 'pending' } : { kind: 'unmeasurable' };
}

/**
 * Readings that broke the rule, in the order taken: a jumper reading with a joined wire not measured at most the
 * limit (key on, same connector) before it, or measured above it. For tests and the benchmark.
 */
export function jumperViolations(readings: ReadonlyArray<{ id: string; request: MeasurementRequest; value: number | 'overload' }>): Array<{ readingId: string; wire: Point; why: string }> {
  return readings.flatMap((r, i) => {
    const before = readings.slice(0, i);
    const hazards = r.request.jumpers.flatMap((j) => {
      const h = jumperHazard(j);
      return h ? [{ readingId: r.id, wire: j.from, why: h.message }] : [];
    });
    const unmeasured = joinedWires(r.request).flatMap((wire) => {
      const volts = before.filter((q) => measuresWire(q.request, wire, r.request.location)).map((q) => (typeof q.value === 'number' ? Math.abs(q.value) : Infinity));
      if (volts.length === 0) return [{ readingId: r.id, wire, why: 'not measured before the jumper' }];
      const high = volts.find((v) => v > JUMPER_SAFE_VOLTS);
      return high === undefined ? [] : [{ readingId: r.id, wire, why: `read ${high} V before the jumper` }];
    });
    return [...hazards, ...unmeasured];
  });
}
