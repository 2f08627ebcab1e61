/**
 * Sample proof views for tests, benchmarks and demos. Everything here is invented (shop, people, make, model);
 * VIN 1M8GDM9AXKP042788 is a textbook VIN whose 49 CFR 565 check digit is valid (weighted sum 351, 351 mod 11 = 10,
 * "X"), and its tenth character K stands for model year 2019.
 */
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import { evidenceDigest, type DiagnosticStep, type ProofView, type Reading, type VerificationCheck } from '../../src/proof-render';

/** The view with its latest approval given on exactly its evidence (so the foreman's signature holds). */
export function approvedOnItsEvidence(view: ProofView): ProofView {
  const d = view.signOff.decisions;
  const last = d[d.length - 1];
  if (last?.decision !== 'approved') return view;
  const digest = evidenceDigest(view);
  return { ...view, signOff: { ...view.signOff, foremanSignedAt: last.at, decisions: [...d.slice(0, -1), { ...last, evidenceDigest: digest }] } };
}

/** A reading as entered, with its SI value written out by hand (no conversion code involved). */
export function rd(entered: string, value: number | null, unit: string, si: number | null, siUnit: string): Reading {
  return { entered, value, unit, si, siUnit };
}
export const volts = (v: number, text = `${v.toFixed(2)} V`): Reading => rd(text, v, 'V', v, 'V');

const TECH = 'Marek Solvang';
const FOREMAN = 'Idunn Carrow';

const koeo = (over: Partial<MeasurementRequest>): MeasurementRequest => ({
  quantity: 'dc_volts',
  at: 'signal',
  against: 'ground',
  location: 'sensor_connector',
  connector: 'unplugged',
  key: 'on',
  engine: 'off',
  jumpers: [],
  ...over,
});

const SCAN_TP1: MeasurementRequest = { quantity: 'scan_value', at: 'signal', location: 'module_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid: '11 (throttle position)' };
const CONTINUITY: MeasurementRequest = {
  quantity: 'ohms', at: 'signal', against: 'ground', location: 'module_connector', connector: 'unplugged', key: 'off', engine: 'off',
  jumpers: [{ from: 'signal', to: 'ground', via: { kind: 'fused_jumper' } }],
};

/** A fresh, unshared copy each call (a JSON round trip), so a test may edit it freely. */
export function sampleView(): ProofView {
  return JSON.parse(JSON.stringify(buildSample())) as ProofView;
}

function buildSample(): ProofView {
  const diagnosis: DiagnosticStep[] = [
    {
      id: 'd1', seq: 1, circuitId: 'tp1', title: 'Throttle position on the scan tool, throttle closed', request: SCAN_TP1,
      reading: rd('100 %', 100, '%', 100, '%'), expected: { min: 10, max: 25, unit: '%' },
      outcome: { code: 'signal_high', label: 'Signal stuck high' }, takenAt: '2025-03-11T09:10:00-05:00', takenBy: TECH, superseded: [],
    },
    {
      id: 'd2', seq: 2, circuitId: 'tp1', title: '5 V reference at the sensor', request: koeo({ at: 'reference' }),
      reading: volts(5.01), expected: { min: 4.9, max: 5.1, unit: 'V' },
      outcome: { code: 'reference_ok', label: 'Reference present and within range' }, takenAt: '2025-03-11T09:18:00-05:00', takenBy: TECH, superseded: [],
    },
    {
      id: 'd3', seq: 3, circuitId: 'tp1', title: 'Sensor ground voltage drop', request: koeo({ at: 'ground', against: 'battery_negative', connector: 'backprobed' }),
      reading: rd('12 mV', 12, 'mV', 0.012, 'V'), expected: { min: null, max: 0.1, unit: 'V' },
      outcome: { code: 'ground_ok', label: 'Sensor ground good' }, takenAt: '2025-03-11T09:31:00-05:00', takenBy: TECH,
      superseded: [{
        reading: volts(0.86), takenAt: '2025-03-11T09:24:00-05:00', takenBy: TECH, correctedAt: '2025-03-11T09:31:00-05:00', correctedBy: TECH,
        reason: 'Black lead was on a painted bracket, not on battery negative; measured again.',
      }],
    },
    {
      id: 'd4', seq: 4, circuitId: 'tp1', title: 'Signal voltage at the sensor, connector unplugged', request: koeo({}),
      reading: volts(0, '0.00 V'), expected: { min: 4.7, max: 5.0, unit: 'V' },
      outcome: { code: 'no_bias_at_sensor', label: 'No module bias at the sensor end' }, takenAt: '2025-03-11T09:38:00-05:00', takenBy: TECH, superseded: [],
      note: 'With the module pull-up intact a 10 MΩ meter reads about 4.87 V here; 0.00 V points to a break between sensor and module.',
    },
    {
      id: 'd5', seq: 5, circuitId: 'tp1', title: 'Signal voltage at the module, sensor unplugged', request: koeo({ location: 'module_connector', connector: 'backprobed' }),
      reading: volts(4.87), expected: { min: 4.7, max: 5.0, unit: 'V' },
      outcome: { code: 'bias_at_module', label: 'Module bias present at the module' }, takenAt: '2025-03-11T09:47:00-05:00', takenBy: TECH, superseded: [],
    },
    {
      id: 'd6', seq: 6, circuitId: 'tp1', title: 'Signal wire end to end (jumpered to ground at the sensor)', request: CONTINUITY,
      reading: rd('OL', null, 'Ω', null, 'Ω'), expected: { min: null, max: 5, unit: 'Ω' },
      outcome: { code: 'signal_open', label: 'Signal wire open between sensor and module' }, takenAt: '2025-03-11T10:05:00-05:00', takenBy: TECH, superseded: [],
    },
    {
      id: 'd7', seq: 7, circuitId: 'tp2', title: 'Second throttle signal, throttle closed', request: koeo({ connector: 'backprobed' }),
      reading: volts(0.82), expected: { min: 0.4, max: 1.2, unit: 'V' },
      outcome: { code: 'signal_ok', label: 'Signal in range' }, takenAt: '2025-03-11T10:12:00-05:00', takenBy: TECH, superseded: [],
    },
  ];

  const check = (id: string, seq: number, step: DiagnosticStep, after: Reading, takenAt: string, extra: Partial<VerificationCheck> = {}): VerificationCheck => ({
    id, seq, circuitId: step.circuitId, repeatsStepId: step.id, title: step.title, request: step.request,
    before: step.reading, after, expected: step.expected!, pass: true, provesFix: ['d4', 'd5', 'd6'].includes(step.id), takenAt, takenBy: TECH, superseded: [], ...extra,
  });
  const verification: VerificationCheck[] = [
    check('v1', 1, diagnosis[5]!, rd('0.3 Ω', 0.3, 'Ω', 0.3, 'Ω'), '2025-03-11T13:02:00-05:00'),
    check('v2', 2, diagnosis[3]!, volts(4.86), '2025-03-11T13:09:00-05:00', {
      superseded: [{
        reading: volts(2.31), takenAt: '2025-03-11T13:06:00-05:00', takenBy: TECH, correctedAt: '2025-03-11T13:09:00-05:00', correctedBy: FOREMAN,
        reason: 'Taken with the sensor still plugged in; repeated with the connector unplugged as in step 4.',
      }],
    }),
    check('v3', 3, diagnosis[0]!, rd('14.5 %', 14.5, '%', 14.5, '%'), '2025-03-11T13:15:00-05:00'),
    check('v4', 4, diagnosis[1]!, volts(5.0, '5.00 V'), '2025-03-11T13:20:00-05:00'),
    check('v5', 5, diagnosis[6]!, volts(0.81), '2025-03-11T13:24:00-05:00'),
  ];

  return approvedOnItsEvidence({
    format: 'tracebay.proof/2',
    shop: { name: 'Kestrelmoor Auto Service', addressLines: ['27 Tannery Lane', 'Ashcombe Vale, 4410'], phone: '+1 555 0142 7788', timeZone: 'America/Chicago' },
    repairOrder: { number: 'RO-25-0311-07', openedAt: '2025-03-11T08:05:00-05:00', repairedAt: '2025-03-11T11:40:00-05:00', verifiedAt: '2025-03-11T13:24:00-05:00' },
    technician: { name: TECH, id: 'T-114' },
    foreman: { name: FOREMAN, id: 'F-03' },
    vehicle: { vin: '1M8GDM9AXKP042788', vinCheck: 'valid', year: 2019, make: 'Aldercrest', model: 'Pathline LX', engine: '2.0 L I4 gasoline, electronic throttle', odometer: { in: 84215, out: 84222, unit: 'mi' } },
    concern: {
      complaint: 'Check-engine light on, engine stays at a raised idle and the vehicle will not rev above about 2000 rpm (reduced-power mode). Started after the customer drove over a rough level crossing.',
      cause: 'Signal wire of throttle position sensor 1 chafed through against the intake support bracket and broke inside the insulation, so the module saw its own pull-up (signal high).',
      correction: 'Cut out the damaged section, spliced in new wire with sealed solder sleeves, sleeved the harness and re-routed it on its clip away from the bracket. Cleared codes and confirmed all readings back in range.',
    },
    troubleCodes: {
      found: [
        { code: 'P0123', description: 'Throttle/pedal position sensor/switch "A" circuit high', status: 'current' },
        { code: 'P2135', description: 'Throttle/pedal position sensor/switch "A"/"B" voltage correlation', status: 'current' },
      ],
      afterRepair: { check: { method: 'cleared_then_key_cycles', keyCycles: 3, checkedAt: '2025-03-11T13:30:00-05:00' }, codes: [] },
    },
    circuits: [
      { id: 'tp1', name: 'Throttle position sensor 1', kind: 'three_wire_5v' },
      { id: 'tp2', name: 'Throttle position sensor 2', kind: 'three_wire_5v' },
    ],
    diagnosis,
    causes: [
      {
        circuitId: 'tp1', proven: true, leading: [],
        cause: { code: 'signal_open', label: 'Open in the signal wire between throttle position sensor 1 and the module', probability: 0.962 },
        decidingStepIds: ['d4', 'd5', 'd6'],
      },
    ],
    repairs: [
      {
        circuitId: 'tp1', labour: { clockOnAt: '2025-03-11T10:45:00-05:00', clockOffAt: '2025-03-11T11:20:00-05:00', minutes: 35 },
        action: 'Spliced the signal wire with sealed solder sleeves', location: 'Signal wire, 18 cm from the sensor connector, where the harness crosses the intake support bracket',
        parts: [{ number: 'KAS-SS-0510', description: 'Sealed solder sleeve, 0.5–1.0 mm²', quantity: 2 }, { description: 'Automotive wire 0.75 mm², 10 cm', quantity: 1 }],
        by: TECH, at: '2025-03-11T11:20:00-05:00',
      },
      {
        circuitId: 'tp1', labour: { clockOnAt: null, clockOffAt: null, minutes: 15 },
        action: 'Sleeved the harness and re-secured it on its clip', location: 'Sensor harness, intake support bracket',
        parts: [{ description: 'Split convoluted sleeve, 10 mm, 30 cm', quantity: 1 }], by: TECH, at: '2025-03-11T11:40:00-05:00',
        note: 'Bracket edge deburred; at least 15 mm clearance to the harness at full engine rock.',
      },
    ],
    verification,
    signOff: {
      technicianSignedAt: '2025-03-11T13:40:00-05:00',
      foremanSignedAt: '2025-03-11T14:50:00-05:00',
      decisions: [
        { decision: 'returned', by: FOREMAN, at: '2025-03-11T14:05:00-05:00', comment: 'Add the scan-tool throttle reading after the repair, not only the meter readings.' },
        { decision: 'approved', by: FOREMAN, at: '2025-03-11T14:50:00-05:00', comment: 'Repair proven; harness routing checked.' },
      ],
    },
    cautions: ['engine_in_bay', 'fused_jumpers_only', 'backprobe_gently'],
  });
}

/** The same job before any after-repair readings: no verification, nothing signed, no foreman decision. */
export function notVerifiedView(): ProofView {
  const v = sampleView();
  return {
    ...v,
    repairOrder: { ...v.repairOrder, verifiedAt: null },
    verification: [],
    troubleCodes: { ...v.troubleCodes, afterRepair: { check: null, codes: [] } },
    foreman: null,
    signOff: { technicianSignedAt: null, foremanSignedAt: null, decisions: [] },
  };
}

/** Reading templates for the long proof: entered text, value, unit, SI value, SI unit, range. */
const TEMPLATES: Array<{ title: string; reading: Reading; expected: ProofView['diagnosis'][number]['expected']; request: MeasurementRequest }> = [
  { title: 'Reference at the sensor', reading: volts(5.02), expected: { min: 4.9, max: 5.1, unit: 'V' }, request: koeo({ at: 'reference' }) },
  { title: 'Signal, connector unplugged', reading: volts(4.87), expected: { min: 4.7, max: 5.0, unit: 'V' }, request: koeo({}) },
  { title: 'Signal path resistance to bias', reading: rd('253 kΩ', 253, 'kΩ', 253000, 'Ω'), expected: { min: 200, max: 300, unit: 'kΩ' }, request: { ...CONTINUITY, jumpers: [] } },
  { title: 'Ground drop, back-probed', reading: rd('18 mV', 18, 'mV', 0.018, 'V'), expected: { min: null, max: 0.1, unit: 'V' }, request: koeo({ at: 'ground', against: 'battery_negative', connector: 'backprobed' }) },
  { title: 'Coolant temperature on the scan tool', reading: rd('83 °C', 83, '°C', 83, '°C'), expected: { min: 75, max: 105, unit: '°C' }, request: { ...SCAN_TP1, pid: '05 (coolant temperature)', engine: 'running' } },
  { title: 'Reference current draw', reading: rd('8.4 mA', 8.4, 'mA', 0.0084, 'A'), expected: { min: null, max: 20, unit: 'mA' }, request: koeo({ quantity: 'amps', at: 'reference', against: 'signal', connector: 'plugged' }) },
  { title: 'Leakage to reference', reading: rd('0.6 µA', 0.6, 'µA', 0.0000006, 'A'), expected: { min: null, max: 5, unit: 'µA' }, request: koeo({ quantity: 'amps', at: 'signal', against: 'reference' }) },
];

/** The same reading with twice the value (a mistyped entry that gets corrected). */
function doubled(r: Reading): Reading {
  const value = (r.value ?? 0) * 2;
  return { ...r, entered: `${Number(value.toPrecision(4))} ${r.unit}`, value, si: (r.si ?? 0) * 2 };
}

/** A long proof: `n` diagnostic readings (with notes and corrections sprinkled in) and a dozen verification checks. */
export function manyReadingsView(n = 200): ProofView {
  const base = sampleView();
  const diagnosis: DiagnosticStep[] = Array.from({ length: n }, (_, i) => {
    const t = TEMPLATES[i % TEMPLATES.length]!;
    const minute = String(i % 60).padStart(2, '0');
    const hour = String(9 + Math.floor(i / 60)).padStart(2, '0');
    const at = `2025-03-12T${hour}:${minute}:30-05:00`;
    return {
      id: `s${i + 1}`, seq: i + 1, circuitId: i % 3 === 0 ? 'tp2' : 'tp1', title: `${t.title} (run ${i + 1})`, request: t.request,
      reading: t.reading, expected: t.expected, outcome: { code: 'in_range', label: 'Within the expected range' }, takenAt: at, takenBy: TECH,
      superseded: i % 17 === 5
        ? [{ reading: doubled(t.reading), takenAt: at, takenBy: TECH, correctedAt: at, correctedBy: FOREMAN, reason: 'Entered in the wrong row.' }]
        : [],
      note: i % 23 === 7
        ? `Long note ${i + 1}: ${'The reading was repeated with the harness flexed along its run from the bulkhead to the sensor, gently and at several points, without any change on the meter. '.repeat(4)}`
        : undefined,
    };
  });
  for (const s of diagnosis) if (s.note === undefined) delete s.note;
  const verification: VerificationCheck[] = diagnosis.slice(0, 12).map((s, i) => ({
    id: `c${i + 1}`, seq: i + 1, circuitId: s.circuitId, repeatsStepId: s.id, title: s.title, request: s.request,
    before: s.reading, after: s.reading, expected: s.expected!, pass: true, provesFix: false, takenAt: '2025-03-12T15:00:00-05:00', takenBy: TECH, superseded: [],
  }));
  return approvedOnItsEvidence({
    ...base,
    diagnosis,
    causes: [{ ...base.causes[0]!, decidingStepIds: ['s2', 's3'] }],
    verification,
    cautions: ['engine_in_bay', 'fused_jumpers_only', 'backprobe_gently'],
  });
}

/** A typical short job: one circuit, four tests, two checks, approved first time (three pages on A4). */
export function typicalView(): ProofView {
  const v = sampleView();
  const keep = new Set(['d1', 'd2', 'd4', 'd6']);
  return approvedOnItsEvidence({
    ...v,
    causes: [{ ...v.causes[0]!, decidingStepIds: ['d4', 'd6'] }],
    circuits: v.circuits.filter((c) => c.id === 'tp1'),
    diagnosis: v.diagnosis.filter((s) => keep.has(s.id)),
    verification: v.verification.filter((c) => ['v1', 'v2'].includes(c.id)).map((c) => ({ ...c, superseded: [] })),
    repairs: v.repairs.slice(0, 1),
    repairOrder: { ...v.repairOrder, verifiedAt: '2025-03-11T13:09:00-05:00' },
    signOff: { ...v.signOff, foremanSignedAt: '2025-03-11T14:05:00-05:00', decisions: [{ decision: 'approved', by: v.foreman!.name, at: '2025-03-11T14:05:00-05:00' }] },
    cautions: ['fused_jumpers_only', 'backprobe_gently'],
  });
}
