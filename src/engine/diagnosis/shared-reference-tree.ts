/**
 * The shared 5 V reference tree for any number of sensors, generated from the list of sensors: a cause per sensor
 * (shorted inside, dragging the reference down), the harness shorted to ground, the module's supply weak or dead,
 * no fault now and unknown; a test per sensor (the reference at its connector with only that sensor unplugged), the
 * reference with every sensor plugged and with all unplugged, and ohms to ground with all unplugged. The deciding
 * test is unplugging the sensors one at a time: a rail that recovers to about 4.8–5.0 V only with one sensor
 * unplugged names that sensor (common practice, no source); a weak supply recovers a little with each.
 *
 * Likelihoods come from the shared-reference circuit model by Monte Carlo. The model is symmetric in its sensors,
 * so what a test predicts for a cause depends only on their roles (the sensor measured at, another sensor, the
 * trunk, the measured branch, another branch): the cells are derived once per sensor count
 * (`deriveSharedReferenceCells`, stored by scripts/derive-likelihoods.ts) and laid out for any list of sensors.
 */
import { defaultSharedReference, percentile, sampleSharedReadings, type SharedFault, type SharedRequest } from '../circuit';
import type { MeasurementRequest } from '../vocabulary';
import { partitionOf } from './compile-predictive';
import { loadTree } from './load-tree';
import type { Tree } from './tree-model';
import { conditionInterval } from './outcome-rules';
import { coreMass, QUANTILE_LEVELS, type Cell } from './predictive';
import { SHARED_REFERENCE_SENSORS } from './tree-limits';
import { TREE_FORMAT, type TestDocument, type TreeDocument } from './tree-schema';
import storedCells from '../trees/derived/shared-reference-cells.json';

export const TEST_ROLES = ['plugged', 'self_unplugged', 'all_unplugged', 'ohms_all_unplugged'] as const;
export type TestRole = (typeof TEST_ROLES)[number];
/** Fault forms by severity (common practice, no source); how severe is one property of the circuit, shared by every test. */
const SENSOR_SHORTS: Array<[number, number]> = [[0.3, 0.6], [0.6, 1.2], [1.2, 3], [3, 8], [8, 25]];
const HARNESS_SHORTS: Array<[number, number]> = [[0.01, 0.1], [0.1, 0.5], [0.5, 2], [2, 8], [8, 25]];
const WEAK_OUTPUTS: Array<[number, number]> = [[20, 35], [35, 60], [60, 100], [100, 180], [180, 320], [320, 560], [560, 1000], [1000, 2000]];
const LOW_SET_POINTS: Array<[number, number]> = [[0, 0.1], [0.1, 0.3], [3.0, 3.75], [3.75, 4.6]];

export const CAUSE_ROLES = [
  ...SENSOR_SHORTS.map((_, k) => `sensor_measured_${k}`),
  ...SENSOR_SHORTS.map((_, k) => `sensor_other_${k}`),
  ...HARNESS_SHORTS.map((_, k) => `short_${k}`),
  ...LOW_SET_POINTS.map((_, k) => `supply_set_${k}`),
  ...WEAK_OUTPUTS.map((_, k) => `supply_weak_${k}`),
  'healthy',
];
export type CauseRole = string;

/**
 * Fault forms (common practice, no source): a sensor shorted inside at 0.3–25 Ω; the harness shorted to ground at
 * 0.01–25 Ω (a chafe through to metal or a wet partial one; where along the harness moves a reading by a few
 * millivolts only, so it is drawn on the trunk); the supply dead (0–0.3 V), set low (3.0–4.5 V) or weak (output
 * resistance 20 Ω–2 kΩ). Each range is split into alternatives: how severe a fault is holds for every test, so a
 * rail that recovers fully with one sensor unplugged cannot be a supply that sagged to a third with all plugged.
 */
function roleFaults(role: CauseRole, ids: string[]): SharedFault[] {
  const [, kind, k] = /^(sensor_measured|sensor_other|short|supply_set|supply_weak|healthy)_?(\d*)$/.exec(role)!;
  const i = Number(k);
  if (kind === 'sensor_measured') return [{ kind: 'sensor_loading', sensor: ids[0]!, ohms: SENSOR_SHORTS[i]! }];
  if (kind === 'sensor_other') return [{ kind: 'sensor_loading', sensor: ids[1]!, ohms: SENSOR_SHORTS[i]! }];
  if (kind === 'short') return [{ kind: 'reference_short_ground', at: 'trunk', ohms: HARNESS_SHORTS[i]! }];
  if (kind === 'supply_set') return [{ kind: 'supply_low', volts: LOW_SET_POINTS[i]! }];
  if (kind === 'supply_weak') return [{ kind: 'supply_weak', ohms: WEAK_OUTPUTS[i]! }];
  return [];
}

const ROLE_REQUESTS: Record<TestRole, (ids: string[]) => SharedRequest> = {
  plugged: (ids) => ({ quantity: 'dc_volts', at: ids[0]!, unplugged: [], key: 'on' }),
  self_unplugged: (ids) => ({ quantity: 'dc_volts', at: ids[0]!, unplugged: [ids[0]!], key: 'on' }),
  all_unplugged: (ids) => ({ quantity: 'dc_volts', at: ids[0]!, unplugged: ids, key: 'on' }),
  ohms_all_unplugged: (ids) => ({ quantity: 'ohms', at: ids[0]!, unplugged: ids, key: 'off' }),
};

/**
 * Latent classes of a shared reference: a supply without a current limit, or one limited somewhere in 60–250 mA
 * (common practice, no source), split in four so that the limit, like the severity, is one value for every test.
 */
export const SHARED_CLASSES: ReadonlyArray<{ id: string; weight: number; limit?: [number, number] }> = [
  { id: 'no_current_limit', weight: 0.5 },
  { id: 'limit_60_90_ma', weight: 0.125, limit: [0.06, 0.09] },
  { id: 'limit_90_130_ma', weight: 0.125, limit: [0.09, 0.13] },
  { id: 'limit_130_180_ma', weight: 0.125, limit: [0.13, 0.18] },
  { id: 'limit_180_250_ma', weight: 0.125, limit: [0.18, 0.25] },
];

/** Seed and draws per cell of the shared reference's derivation (scripts/derive-likelihoods.ts). */
export const SHARED_DERIVATION = { seed: 20_261_203, samples: 240 } as const;

/** Weights of the alternatives of the two causes that stand for several faults (common practice, no source). */
const SUPPLY_FORMS: Array<[CauseRole, number]> = [
  ['supply_set_0', 0.2],
  ['supply_set_1', 0.2],
  ['supply_set_2', 0.15],
  ['supply_set_3', 0.15],
  ...WEAK_OUTPUTS.map((_, k): [CauseRole, number] => [`supply_weak_${k}`, 0.3 / WEAK_OUTPUTS.length]),
];

export interface StoredCell {
  q: number[];
  overload?: number;
}
export interface SharedCells {
  cells: StoredCell[];
  /** Per test role and cause role, the cell of each class. */
  roles: Record<TestRole, Record<CauseRole, number[]>>;
}
export interface SharedCellsDocument {
  seed: number;
  samples: number;
  counts: Record<string, SharedCells>;
}

function toCell(values: Float64Array): StoredCell {
  let finite = values.length;
  while (finite > 0 && !Number.isFinite(values[finite - 1]!)) finite--;
  const head = values.subarray(0, finite);
  const q = finite ? QUANTILE_LEVELS.map((l) => Number(percentile(head, l).toPrecision(4))) : [];
  const overload = Number((1 - finite / values.length).toFixed(4));
  return overload > 0 ? { q, overload } : { q };
}

/** The predictive cells of an `n`-sensor shared reference, by role, from the circuit model. */
export function deriveSharedReferenceCells(n: number, opts: { seed: number; samples: number }): SharedCells {
  const ids = Array.from({ length: n }, (_, i) => `s${i}`);
  const cells: StoredCell[] = [];
  const seen = new Map<string, number>();
  const roles = {} as SharedCells['roles'];
  for (const test of TEST_ROLES) {
    roles[test] = {} as Record<CauseRole, number[]>;
    for (const cause of CAUSE_ROLES) {
      roles[test][cause] = SHARED_CLASSES.map((cls, c) => {
        // Half the draws with the measured sensor a potentiometer and its neighbour drawing 8 mA, half the other way.
        const pooled: Float64Array[] = [];
        for (const [k, first] of (['potentiometer', 'pressure'] as const).entries()) {
          const kinds = ids.map((_, i) => ((i % 2 === 0) === (first === 'potentiometer') ? 'potentiometer' : 'pressure'));
          const circuit = defaultSharedReference(ids, { kinds, currentLimitAmps: cls.limit ? cls.limit[1] : undefined });
          const sampled = sampleSharedReadings({ circuit, faults: roleFaults(cause, ids), request: ROLE_REQUESTS[test](ids), samples: Math.round(opts.samples / 2), seed: opts.seed + 97 * c + 31 * k, spreads: cls.limit ? { currentLimitAmps: cls.limit } : {} });
          if (!sampled.ok) return -1;
          pooled.push(sampled.value);
        }
        const cell = toCell(Float64Array.from([...pooled[0]!, ...pooled[1]!]).sort());
        const key = JSON.stringify(cell);
        if (!seen.has(key)) seen.set(key, cells.push(cell) - 1);
        return seen.get(key)!;
      });
    }
  }
  return { cells, roles };
}

export interface SharedSensor {
  /** Lower-case id used in the tree's ids and in readings' `sensor` field. */
  id: string;
  /** What the technician calls it, e.g. "manifold pressure sensor". */
  label: string;
  /** Reaching its connector: minutes and steps (defaults: 3 minutes, "reach the connector"). */
  reach?: { minutes: number; steps: string[] };
}

const VOLTS_OUTCOMES: TestDocument['outcomes'] = [
  { id: 'low', label: 'Below 4.5 V: pulled down', condition: { all: [{ fact: 'value', operator: 'inRange', value: [-1, 4.5] }] } },
  { id: 'ok', label: 'About 5 V (4.8 to 5.15 V)', condition: { all: [{ fact: 'value', operator: 'inRange', value: [4.8, 5.15] }] } },
  { id: 'high', label: 'Above 5.3 V', condition: { all: [{ fact: 'value', operator: 'inRange', value: [5.3, 40] }] } },
];
const OHMS_OUTCOMES: TestDocument['outcomes'] = [
  { id: 'short', label: 'Under 20 Ω: shorted to ground', condition: { all: [{ fact: 'value', operator: 'inRange', value: [-1, 20] }] } },
  { id: 'normal', label: '200 Ω to 100 kΩ', condition: { all: [{ fact: 'value', operator: 'inRange', value: [200, 100000] }] } },
  { id: 'open', label: 'Above 1 MΩ or overload', condition: { all: [{ fact: 'value', operator: 'greaterThanInclusive', value: 1000000 }] } },
];
const PRECONDITIONS = ['Battery charged (at least 12.2 V key off).', 'Trouble codes recorded before anything is unplugged.'];
const base = { at: 'reference', against: 'battery_negative', location: 'sensor_connector', engine: 'off', jumpers: [] as TestDocument['request']['jumpers'] } as const;

/** The hypothesis id of a sensor dragging the reference down. */
export const loadingCause = (sensor: string) => `${sensor}_sensor_loading_reference`;

/** A shared-reference tree for the given sensors, likelihoods laid out from the stored cells of their count. */
export function sharedReferenceTree(sensors: SharedSensor[], meta: { id?: string; title?: string } = {}, stored: SharedCellsDocument = storedCells as unknown as SharedCellsDocument): TreeDocument {
  const n = sensors.length;
  if (n < SHARED_REFERENCE_SENSORS.min || n > SHARED_REFERENCE_SENSORS.max) throw new RangeError(`a shared reference has ${SHARED_REFERENCE_SENSORS.min} to ${SHARED_REFERENCE_SENSORS.max} sensors, not ${n}`);
  const first = sensors[0]!;
  const all = sensors.map((s) => `reach_${s.id}`);
  const doc: TreeDocument = {
    format: TREE_FORMAT,
    id: meta.id ?? `shared-reference-${n}`,
    version: '2.0.0',
    circuitKind: 'shared_5v_reference',
    title: meta.title ?? `Shared 5 V reference feeding ${n} sensors`,
    settings: { likelihoodFloor: 0.02, concludeAt: 0.95 },
    hypotheses: [
      ...sensors.map((s) => ({ id: loadingCause(s.id), label: `${capital(s.label)} shorted inside, pulling the shared reference down`, prior: Number((0.55 / n).toFixed(4)), repair: { part: `${s.id}_sensor`, action: `Replace the ${s.label}.` } })),
      { id: 'reference_short_ground', label: 'Shared reference wire shorted to ground in the harness', prior: 0.15, repair: { part: 'reference', action: 'Find and repair the chafe grounding the shared reference wire (check each branch to a sensor).' } },
      { id: 'module_regulator', label: "Module's 5 V supply weak or dead", prior: 0.15, repair: { part: 'module', action: 'Confirm with the service information, then repair or replace the module.' } },
      { id: 'no_fault_now', label: 'No fault on the shared reference now (an intermittent, or the fault is elsewhere)', prior: 0.1, repair: { part: 'none', action: 'No repair: the reference tests good now. Look for an intermittent with a wiggle test (flex the harness and connectors along the run while repeating the reading), then check each circuit on its own.' } },
      { id: 'unknown', label: 'Not modelled by this tree (look further)', prior: 0.05, unknown: true, repair: { part: 'unknown', action: 'Go beyond this tree: intermittent wiring, another sensor on the same reference, or a cause the tree does not model.' } },
    ],
    setups: sensors.map((s) => ({ id: `reach_${s.id}`, label: `Reach the ${s.label} connector`, minutes: s.reach?.minutes ?? 3, steps: s.reach?.steps ?? [`Clear access to the ${s.label} connector.`] })),
    tests: [
      test('reference_plugged', `Shared reference at the ${first.label}, all plugged, key on`, ['Key on, engine off. Back-probe the connector with the sensor plugged in.', `At the ${first.label}: black lead on battery negative, red lead on the 5 V reference wire.`, 'Read DC volts.'], { ...base, quantity: 'dc_volts', connector: 'backprobed', key: 'on', sensor: first.id }, [`reach_${first.id}`], 2, VOLTS_OUTCOMES),
      ...sensors.map((s) =>
        test(`reference_${s.id}_unplugged`, `Shared reference with the ${s.label} unplugged`, [`Key off, unplug only the ${s.label}.`, 'Key on, engine off.', `Red lead in the harness-side reference terminal of the ${s.label}, black on battery negative.`, 'Read DC volts. If it recovers to about 5 V, this sensor was pulling the reference down.', 'Key off and plug the sensor back in.'], { ...base, quantity: 'dc_volts', connector: 'unplugged', key: 'on', sensor: s.id }, [`reach_${s.id}`], 2, VOLTS_OUTCOMES, [`${s.id}_sensor`, 'reference', 'module']),
      ),
      test('reference_all_unplugged', 'Shared reference with every sensor on it unplugged', [`Key off, unplug all ${n} sensors on the shared reference.`, 'Key on, engine off.', `Red lead in the harness-side reference terminal at the ${first.label}, black on battery negative.`, 'Read DC volts. Still low with nothing connected points at the harness or the module.'], { ...base, quantity: 'dc_volts', connector: 'unplugged', key: 'on', sensor: 'all' }, all, 2 + n / 2, VOLTS_OUTCOMES, ['reference', 'module']),
      test('reference_ohms_all_unplugged', 'Shared reference to ground, ohms, every sensor unplugged, key off', [`Key off, all ${n} sensors on the shared reference unplugged.`, `Ohmmeter between the harness-side reference terminal at the ${first.label} and battery negative.`, 'Read ohms: near 0 Ω means the harness is shorted to ground.'], { ...base, quantity: 'ohms', connector: 'unplugged', key: 'off', sensor: 'all' }, all, 3, OHMS_OUTCOMES, ['reference', 'module']),
    ],
    derivation: { method: 'circuit_model_monte_carlo', note: 'Laid out from the shared-reference circuit model’s cells by role (derived per sensor count).' },
  };
  return applySharedReferenceCells(doc, stored);
}

/** The built-in three-sensor tree (`shared-reference`): throttle position, manifold pressure, fuel-tank pressure. */
export const BUILT_IN_SHARED_SENSORS: SharedSensor[] = [
  { id: 'throttle', label: 'throttle position sensor', reach: { minutes: 3, steps: ['Remove the intake duct cover over the throttle body.'] } },
  { id: 'manifold', label: 'manifold pressure sensor', reach: { minutes: 4, steps: ['Remove the engine cover over the intake manifold.'] } },
  { id: 'tank', label: 'fuel-tank pressure sensor', reach: { minutes: 15, steps: ['Raise the vehicle safely on a lift or stands.', 'Remove the shield over the tank sensor connector.'] } },
];

export const builtInSharedReferenceTree = (stored?: SharedCellsDocument) =>
  sharedReferenceTree(BUILT_IN_SHARED_SENSORS, { id: 'shared-reference', title: 'Shared 5 V reference feeding several sensors' }, stored);

/** Cells for every allowed sensor count (what scripts/derive-likelihoods.ts stores). */
export function deriveAllSharedReferenceCells(opts: { seed: number; samples: number }): SharedCellsDocument {
  const counts: Record<string, SharedCells> = {};
  for (let n = SHARED_REFERENCE_SENSORS.min; n <= SHARED_REFERENCE_SENSORS.max; n++) counts[String(n)] = deriveSharedReferenceCells(n, opts);
  return { seed: opts.seed, samples: opts.samples, counts };
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

function test(id: string, label: string, procedure: string[], request: TestDocument['request'], setups: string[], minutes: number, outcomes: TestDocument['outcomes'], parts?: string[]): TestDocument {
  return { id, label, procedure, request, setups, preconditions: PRECONDITIONS, cautions: [], minutes, ...(parts ? { parts } : {}), outcomes, likelihoods: {} };
}

/** The sensors of a shared-reference document, in the order of their causes. */
export function sensorsOf(doc: TreeDocument): string[] {
  return doc.hypotheses.map((h) => /^(.+)_sensor_loading_reference$/.exec(h.id)?.[1]).filter((s): s is string => s !== undefined);
}

function testRole(request: MeasurementRequest): TestRole {
  if (request.quantity === 'ohms') return 'ohms_all_unplugged';
  if (request.connector !== 'unplugged') return 'plugged';
  return request.sensor === 'all' || request.sensor === undefined ? 'all_unplugged' : 'self_unplugged';
}

/**
 * Lays the cells of the document's sensor count into its tests: predictive blocks, likelihood rows and the
 * derivation (classes, alternatives). The measured sensor is the test's `sensor` (the first one for "all").
 */
export function applySharedReferenceCells(doc: TreeDocument, stored: SharedCellsDocument = storedCells as unknown as SharedCellsDocument): TreeDocument {
  const sensors = sensorsOf(doc);
  const table = stored.counts[String(sensors.length)];
  if (!table) throw new RangeError(`no shared-reference cells for ${sensors.length} sensors`);
  const nC = SHARED_CLASSES.length;
  const tests = doc.tests.map((t) => {
    const role = testRole(t.request);
    const measured = t.request.sensor && t.request.sensor !== 'all' ? t.request.sensor : sensors[0]!;
    const cellsOf = (cause: CauseRole) => table.roles[role][cause];
    const index: Record<string, number[]> = {};
    const weights: Record<string, number[]> = {};
    for (const h of doc.hypotheses) {
      if (h.unknown) continue;
      const sensor = /^(.+)_sensor_loading_reference$/.exec(h.id)?.[1];
      let alts: CauseRole[];
      let w: number[] = [1];
      if (sensor !== undefined) (alts = SENSOR_SHORTS.map((_, k) => `${sensor === measured ? 'sensor_measured' : 'sensor_other'}_${k}`)), (w = SENSOR_SHORTS.map(() => 1 / SENSOR_SHORTS.length));
      else if (h.id === 'reference_short_ground') (alts = HARNESS_SHORTS.map((_, k) => `short_${k}`)), (w = HARNESS_SHORTS.map(() => 1 / HARNESS_SHORTS.length));
      else if (h.id === 'module_regulator') (alts = SUPPLY_FORMS.map(([r]) => r)), (w = SUPPLY_FORMS.map(([, x]) => x));
      else alts = ['healthy'];
      index[h.id] = alts.flatMap(cellsOf);
      weights[h.id] = w;
    }
    const partition = partitionOf(t.outcomes.map((o) => conditionInterval(o.condition)!));
    const likelihoods = Object.fromEntries(
      Object.entries(index).map(([h, cellIds]) => {
        const row = new Float64Array(t.outcomes.length);
        const wsum = weights[h]!.reduce((a, b) => a + b, 0);
        cellIds.forEach((cellId, k) => {
          const share = (weights[h]![Math.floor(k / nC)]! / wsum) * SHARED_CLASSES[k % nC]!.weight;
          const raw = table.cells[cellId];
          const cell: Cell | undefined = raw && { q: Float64Array.from(raw.q), overload: raw.overload ?? 0 };
          const masses = partition.map((r) => (cell ? Math.max(0, coreMass(cell, r.lo, r.hi, t.request.quantity)) : 1));
          const total = masses.reduce((a, b) => a + b, 0);
          masses.forEach((m, o) => (row[o]! += share * (total > 0 ? m / total : 1 / masses.length)));
        });
        return [h, Object.fromEntries(t.outcomes.map((o, oi) => [o.id, Number(row[oi]!.toFixed(4))]))];
      }),
    );
    // Only the cells this test uses, renumbered.
    const used = [...new Set(Object.values(index).flat().filter((c) => c >= 0))].sort((a, b) => a - b);
    const renumber = new Map(used.map((c, k) => [c, k]));
    const ownIndex = Object.fromEntries(Object.entries(index).map(([h, ids]) => [h, ids.map((c) => renumber.get(c) ?? -1)]));
    return { ...t, likelihoods, predictive: { cells: used.map((c) => table.cells[c]!), index: ownIndex } };
  });
  return {
    ...doc,
    tests,
    derivation: {
      ...doc.derivation,
      method: 'circuit_model_monte_carlo',
      seed: stored.seed,
      samples: stored.samples,
      classes: SHARED_CLASSES.map((c) => ({ id: c.id, weight: c.weight, circuits: [{ sensors: sensors.length, ...(c.limit ? { currentLimitAmps: c.limit } : {}) }] })),
      alternatives: {
        ...Object.fromEntries(sensors.map((s) => [loadingCause(s), SENSOR_SHORTS.map(() => 1 / SENSOR_SHORTS.length)])),
        reference_short_ground: HARNESS_SHORTS.map(() => 1 / HARNESS_SHORTS.length),
        module_regulator: SUPPLY_FORMS.map(([, x]) => x),
      },
    },
  };
}

const loaded = new Map<string, Tree>();

/** The loaded tree for a list of sensors (memoised by the sensors' ids and labels; the layout is pure). */
export function sharedReferenceTreeFor(sensors: SharedSensor[], meta: { id?: string; title?: string } = {}): Tree {
  const key = JSON.stringify([sensors, meta]);
  const hit = loaded.get(key);
  if (hit) return hit;
  const result = loadTree(sharedReferenceTree(sensors, meta));
  if (!result.ok) throw new Error(`generated shared-reference tree does not load: ${JSON.stringify(result.findings.slice(0, 3))}`);
  if (loaded.size > 256) loaded.clear();
  loaded.set(key, result.tree);
  return result.tree;
}
