import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, codeLikelihoods, diagnose } from '../../src/engine/diagnosis';
import { FOREMAN_A, newVehicle, TECH_A, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { diagnoseToEnd, simulatedReading } from '../support/simulate';

// Every fault of the built-in three-wire tree (its hypotheses but the catch-all "unknown").
const THREE_WIRE_FAULTS = builtInTrees()['three-wire-5v']!.hypotheses.map((h) => h.id).filter((id) => id !== 'unknown');

describe('diagnosis over HTTP, driven by readings simulated from the circuit model', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi('postgresql');
  });
  afterAll(async () => api?.close());

  async function newCircuit(body: Record<string, unknown> = { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' }) {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 stored', codes: ['P0122'], technicianId: TECH_A } })).body;
    const circuit = await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body });
    return { ro, circuit };
  }

  // The end-to-end check the engine promises: each listed fault, answered with the readings that fault gives,
  // concludes on that fault (physics from the circuit model, itself checked against ngspice).
  it.each(THREE_WIRE_FAULTS)('concludes %s from the readings that fault produces', async (hypothesis) => {
    const { ro, circuit } = await newCircuit();
    const diagnosis = await diagnoseToEnd(api, TECH_A, ro.id, circuit.body.id, hypothesis);
    expect(diagnosis.status).toBe('concluded');
    expect(diagnosis.conclusion).toMatchObject({ hypothesisId: hypothesis });
    expect(diagnosis.conclusion.probability).toBeGreaterThanOrEqual(0.95);
    expect(diagnosis.conclusion.decidedBy.length).toBeGreaterThan(0);
    expect(diagnosis.tree).toMatchObject({ id: 'three-wire-5v', version: expect.stringMatching(/^sha256:/) });
  });

  it('proposes a first test whose request can be posted back as it is, with its cost and cautions', async () => {
    const { ro, circuit } = await newCircuit();
    const diagnosis = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.body.id}/diagnosis`, { user: TECH_A })).body;
    expect(diagnosis.status).toBe('testing');
    expect(diagnosis.ranked.map((h: { id: string }) => h.id)).toEqual(expect.arrayContaining([...THREE_WIRE_FAULTS, 'unknown']));
    expect(diagnosis.nextTest).toMatchObject({ request: expect.objectContaining({ quantity: expect.any(String) }), minutes: expect.any(Number) });
    expect(diagnosis.nextTest.procedure.length).toBeGreaterThan(0);
  });

  it('adds the vehicle-dependent cautions to the next test: the high-voltage caution first on a hybrid, none on a plain car', async () => {
    const hybrid = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle({ vin: '9ZZEV12K7R0000017', highVoltageSystem: true }), complaint: 'Hybrid, throttle code', technicianId: TECH_A } })).body;
    const hvCircuit = (await api.call('POST', `/api/repair-orders/${hybrid.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'FTP', label: 'FTP sensor' } })).body;
    const hv = (await api.call('GET', `/api/repair-orders/${hybrid.id}/circuits/${hvCircuit.id}/diagnosis`, { user: TECH_A })).body;
    const ids = hv.nextTest.cautions.map((c: { id: string }) => c.id);
    expect(ids[0]).toBe('high_voltage_system');
    expect(ids).toEqual(expect.arrayContaining(['fuel_vapour', 'service_information']));
    const { ro, circuit } = await newCircuit();
    const plain = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.body.id}/diagnosis`, { user: TECH_A })).body;
    expect(plain.nextTest.cautions.map((c: { id: string }) => c.id)).not.toContain('high_voltage_system');
  });

  it.each([
    ['one reading', false],
    ['a batch of one', true],
  ])('answers %s posted with diagnosis=true on a hybrid with the vehicle and sensor cautions a GET gives', async (_, batch) => {
    const hybrid = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle({ vin: '9ZZEV12K7R0000017', highVoltageSystem: true }), complaint: 'Hybrid, tank pressure code', technicianId: TECH_A } })).body;
    const circuit = (await api.call('POST', `/api/repair-orders/${hybrid.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'FTP', label: 'FTP sensor' } })).body;
    const first = (await api.call('GET', `/api/repair-orders/${hybrid.id}/circuits/${circuit.id}/diagnosis`, { user: TECH_A })).body;
    const reading = { circuitId: circuit.id, ...first.nextTest.request, ...simulatedReading('signal_open', first.nextTest.request) };
    const posted = await api.call('POST', `/api/repair-orders/${hybrid.id}/measurements?diagnosis=true`, { user: TECH_A, body: batch ? [reading] : reading });
    expect(posted.status).toBe(201);
    const answered = posted.body.diagnoses[0];
    const ids = answered.nextTest.cautions.map((c: { id: string }) => c.id);
    expect(ids[0]).toBe('high_voltage_system');
    expect(ids).toContain('fuel_vapour');
    const after = (await api.call('GET', `/api/repair-orders/${hybrid.id}/circuits/${circuit.id}/diagnosis`, { user: TECH_A })).body;
    expect(answered).toEqual({ circuitId: circuit.id, ...after });
  });

  it('answers a reading posted with diagnosis=true with the same diagnosis a GET right after gives', async () => {
    const { ro, circuit } = await newCircuit();
    const first = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.body.id}/diagnosis`, { user: TECH_A })).body;
    const request = first.nextTest.request;
    const posted = await api.call('POST', `/api/repair-orders/${ro.id}/measurements?diagnosis=true`, {
      user: TECH_A,
      body: { circuitId: circuit.body.id, ...request, ...simulatedReading('signal_open', request), clientKey: 'with-diagnosis-1' },
    });
    expect(posted.status).toBe(201);
    expect(posted.body).toMatchObject({ circuitId: circuit.body.id, clientKey: 'with-diagnosis-1' });
    expect(posted.body.diagnoses).toHaveLength(1);
    const after = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.body.id}/diagnosis`, { user: TECH_A })).body;
    expect(posted.body.diagnoses[0]).toEqual({ circuitId: circuit.body.id, ...after });
    expect(after.path.length).toBe(first.path.length + 1);
  });

  it('answers a batch with diagnosis=true with one diagnosis per circuit, and a re-sent reading with it too', async () => {
    const { ro, circuit } = await newCircuit();
    const other = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } })).body;
    const reference = { quantity: 'dc_volts', at: 'reference', against: 'ground', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 5.0, unit: 'V' };
    const batch = [
      { circuitId: circuit.body.id, ...reference, clientKey: 'batch-diag-1' },
      { circuitId: circuit.body.id, ...reference, value: 4.99, clientKey: 'batch-diag-2' },
    ];
    const posted = await api.call('POST', `/api/repair-orders/${ro.id}/measurements?diagnosis=true`, { user: TECH_A, body: batch });
    expect(posted.status).toBe(201);
    expect(posted.body.items).toHaveLength(2);
    expect(posted.body.diagnoses.map((d: { circuitId: string }) => d.circuitId)).toEqual([circuit.body.id]);
    expect(posted.body.diagnoses.map((d: { circuitId: string }) => d.circuitId)).not.toContain(other.id);
    const again = await api.call('POST', `/api/repair-orders/${ro.id}/measurements?diagnosis=true`, { user: TECH_A, body: batch[0] });
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(posted.body.items[0].id);
    expect(again.body.diagnoses[0]).toMatchObject({ circuitId: circuit.body.id, tree: { id: 'three-wire-5v' } });
  });

  it('pairs a coolant and an intake-air scan value posted as two readings and counts their difference once', async () => {
    const { ro } = await newCircuit();
    const ect = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } })).body;
    const base = { circuitId: ect.id, quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [] };
    // A cold-soaked engine whose coolant sensor reads 20 °C above the intake air (SAE J1979 PID 05 against PID 0F).
    const coolant = await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { ...base, pid: '05', value: 41, unit: '°C', clientKey: 'cold-soak-ect' } });
    expect(coolant.status).toBe(201);
    const volts = await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { ...base, pid: '0F', value: 2.5, unit: 'V', clientKey: 'cold-soak-iat-volts' } });
    expect(volts.status).toBe(400);
    expect(JSON.stringify(volts.body)).toMatch(/°C/);
    const lone = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${ect.id}/diagnosis`, { user: TECH_A })).body;
    expect(lone.path).toEqual([expect.objectContaining({ readingId: coolant.body.id, verdict: 'unpaired' })]);
    const intake = await api.call('POST', `/api/repair-orders/${ro.id}/measurements?diagnosis=true`, { user: TECH_A, body: { ...base, pid: '0F', value: 21, unit: '°C', clientKey: 'cold-soak-iat' } });
    expect(intake.status).toBe(201);
    const d = intake.body.diagnoses[0];
    expect(d.comparisons).toContainEqual(expect.objectContaining({ testId: 'coolant_against_intake_cold_soak', verdict: 'counted', outcomeId: 'coolant_high', difference: 20, unit: '°C' }));
    expect(d.path.map((p: { readingId: string; verdict: string }) => [p.readingId, p.verdict])).toEqual([
      [coolant.body.id, 'paired'],
      [intake.body.id, 'counted'],
    ]);
  });

  it.each(['yes', '1', ''])('refuses diagnosis=%j with a 400 at query.diagnosis and stores nothing', async (value) => {
    const { ro, circuit } = await newCircuit();
    const res = await api.call('POST', `/api/repair-orders/${ro.id}/measurements?diagnosis=${value}`, {
      user: TECH_A,
      body: { circuitId: circuit.body.id, quantity: 'dc_volts', at: 'reference', against: 'ground', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 5, unit: 'V' },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.findings[0]).toMatchObject({ path: 'query.diagnosis' });
    expect((await api.call('GET', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A })).body.items).toHaveLength(0);
  });

  it('refuses a tree made for another kind of circuit with a 400 at body.treeId', async () => {
    const { circuit } = await newCircuit({ kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP', treeId: 'two-wire-thermistor' });
    expect(circuit.status).toBe(400);
    expect(circuit.body.error.findings[0]).toMatchObject({ path: 'body.treeId', code: 'fault_tree.wrong_kind' });
  });

  it('refuses an uploaded tree whose jumper test may be proposed before its wires were measured, naming the path', async () => {
    const own = structuredClone(builtInDocuments()[0]!) as unknown as { id: string; tests: Array<{ id: string; requires?: unknown[] }> };
    own.id = 'bay-unsafe-jumper';
    const i = own.tests.findIndex((t) => t.id === 'jumper_reference_to_signal');
    own.tests[i]!.requires = [];
    const res = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: own });
    expect(res.status).toBe(400);
    expect(res.body.error.findings).toContainEqual(expect.objectContaining({ code: 'tree.jumper_precondition_missing', path: `body.tests.${i}.requires` }));
  });

  it('stores a shop tree as a version, keeps the version a circuit started with, and names paths in a bad upload', async () => {
    const own = { ...(builtInDocuments()[0] as unknown as Record<string, unknown>), id: 'bay-three-wire', title: 'Our three-wire tree' };
    const first = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: own });
    expect(first.status).toBe(201);
    const again = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: own });
    expect(again.status).toBe(200);
    expect(again.body.tree.version).toBe(first.body.tree.version);

    const { circuit } = await newCircuit({ kind: 'three_wire_5v', sensor: 'TP', label: 'TP 1', treeId: 'bay-three-wire' });
    expect(circuit.body.faultTree).toMatchObject({ treeId: 'bay-three-wire', version: first.body.tree.version });
    const changed = { ...own, title: 'Our three-wire tree, revised' };
    const second = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: changed });
    expect(second.body.tree.version).not.toBe(first.body.tree.version);
    const kept = await api.call('GET', `/api/fault-trees/${circuit.body.faultTree.id}`, { user: TECH_A });
    expect(kept.body.label).toBe('Our three-wire tree');

    const broken = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: { ...own, hypotheses: 'none' } });
    expect(broken.status).toBe(400);
    expect(broken.body.error.findings[0].path).toMatch(/^body\.hypotheses/);
    expect((await api.call('POST', '/api/fault-trees', { user: TECH_A, body: own })).status).toBe(403);
    expect((await api.call('GET', `/api/fault-trees/${circuit.body.faultTree.id}`, { user: TECH_B })).status).toBe(404);
  });

  describe('the order’s trouble codes', () => {
    const tree = builtInTrees()['three-wire-5v']!;
    async function coded(codes: string[], sensor: string) {
      const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Reduced power', codes, technicianId: TECH_A } })).body;
      const circuit = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor, label: `${sensor} circuit` } })).body;
      const diagnosis = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.id}/diagnosis`, { user: TECH_A })).body;
      return { ro, circuit, diagnosis };
    }

    it('weighs the codes of the circuit’s sensor into the ranking, as the engine does with the same codes', async () => {
      const { diagnosis } = await coded(['P0122', 'P0107', 'P1234'], 'TP A');
      const engine = await diagnose(tree, [], { codes: { codes: ['P0122', 'P0107', 'P1234'], sensor: 'TP A' } });
      for (const h of engine.ranked) expect(diagnosis.ranked.find((x: { id: string }) => x.id === h.id).probability).toBeCloseTo(h.probability, 3);
      expect(diagnosis.codesWeighed).toEqual([
        expect.objectContaining({ code: 'P0122', weighed: true, window: expect.stringContaining('0.2 V') }),
        expect.objectContaining({ code: 'P0107', weighed: false, effect: expect.stringContaining('concerns MAP') }),
        expect.objectContaining({ code: 'P1234', weighed: false }),
      ]);
      expect(diagnosis.findings).toContainEqual(expect.objectContaining({ code: 'codes.not_in_table', path: 'options.codes.codes[2]' }));
      // A low-input code: the signal short to ground ahead of the short to voltage by at least the code's likelihood ratio (computed from the table).
      const like = codeLikelihoods(tree, 'P0122');
      const index = (id: string) => tree.hypotheses.find((h) => h.id === id)!.index;
      const ratio = like.ok ? like.like[index('signal_short_ground')]! / like.like[index('signal_short_voltage')]! : Infinity;
      const at = (id: string) => diagnosis.ranked.find((x: { id: string }) => x.id === id).probability;
      expect(at('signal_short_ground') / at('signal_short_voltage')).toBeGreaterThan(ratio);
    });

    it('leaves the prior alone for a circuit whose sensor names no single table sensor, and says so', async () => {
      const { diagnosis } = await coded(['P0122'], 'TP');
      const plain = await diagnose(tree, []);
      for (const h of plain.ranked) expect(diagnosis.ranked.find((x: { id: string }) => x.id === h.id).probability).toBeCloseTo(h.probability, 3);
      expect(diagnosis.codesWeighed).toEqual([expect.objectContaining({ code: 'P0122', weighed: false })]);
      expect(diagnosis.findings).toContainEqual(expect.objectContaining({ code: 'codes.sensor_unknown' }));
    });

    it('follows the order’s codes when they are changed', async () => {
      const { ro, circuit, diagnosis } = await coded([], 'MAP');
      expect(diagnosis.codesWeighed).toEqual([]);
      const patched = await api.call('PATCH', `/api/repair-orders/${ro.id}`, { user: FOREMAN_A, body: { version: ro.version, codes: ['P0108'] } });
      expect(patched.status).toBe(200);
      const after = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.id}/diagnosis`, { user: TECH_A })).body;
      expect(after.codesWeighed).toEqual([expect.objectContaining({ code: 'P0108', weighed: true })]);
      expect(after.ranked).not.toEqual(diagnosis.ranked);
    });
  });
});
