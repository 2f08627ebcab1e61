// Load generator for bench/load.bench.ts, run as its own process so that it does not share an event loop (or a
// core's time slices) with the service. Plain Node, no build step. Reads one JSON job from argv[2], prints one
// JSON result line on stdout.
//
//   mode "service": each tablet works one job after another: a repair order with a three-wire circuit that has a
//                   fault drawn for the job; it posts the reading the diagnosis asks for next, with the value the
//                   circuit model gives for that fault, as POST …/measurements?diagnosis=true (the answer carries the
//                   diagnosis recomputed from every reading), until the diagnosis concludes. Keep-alive HTTP/1.1 on
//                   loopback, one connection per tablet; flat out (the next reading as soon as the last is answered)
//                   or paced (one reading every paceMs per tablet, latency counted from when it was due).
//   mode "raw":     each client loops: one INSERT of the same row shape (job.reading) straight into PostgreSQL with pg.
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import { createRequire } from 'node:module';

const job = JSON.parse(process.argv[2]);

function percentile(sorted, q) {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

function summary(times) {
  const sorted = Float64Array.from(times).sort();
  return { n: sorted.length, p50: percentile(sorted, 0.5), p99: percentile(sorted, 0.99), max: sorted[sorted.length - 1] ?? NaN };
}

function request(agent, url, method, path, headers, body) {
  return new Promise((resolve, reject) => {
    const req = http.request(url + path, { method, agent, headers: { ...headers, ...(body ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) } : {}) } }, (res) => {
      const chunks = [];
      res.on('data', (c) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode, text: Buffer.concat(chunks).toString() }));
    });
    req.setTimeout(30_000, () => req.destroy(new Error('timeout')));
    req.on('error', reject);
    req.end(body);
  });
}

// The circuit model (built into dist/ by the benchmark before it starts the service) gives each job's readings.
const require = createRequire(import.meta.url);
const { defaultCircuit, faultsFor, predictReading } = require('../dist/engine/circuit/index.js');
const FAULTS = ['reference_open', 'reference_short_ground', 'signal_open', 'signal_short_ground', 'signal_short_voltage', 'ground_open', 'ground_high_resistance', 'sensor_internal'];
const UNIT = { V: 'V', ohm: 'ohm', A: 'A' };

/** What the meter shows for `request` on a circuit with `fault`, as a technician types it. */
function modelled(fault, request) {
  const p = predictReading(defaultCircuit('three_wire_5v'), faultsFor(fault) ?? [], request);
  if (!p.ok) return { value: 1234.5, unit: 'ohm' };
  if (p.overload || !Number.isFinite(p.value)) return { value: 'OL', unit: UNIT[p.unit] };
  return { value: Number(p.value.toFixed(p.unit === 'ohm' ? 1 : 3)), unit: UNIT[p.unit] };
}

const { withCheckDigit } = require('../dist/engine/vin/index.js');

/** An invented car per job: made-up VIN with a valid 49 CFR 565 check digit (position 9 computed). */
function vehicle(runTag, index, n) {
  const serial = String((index * 10007 + n * 7 + Number(String(runTag).slice(-4).replace(/\D/g, '') || 0)) % 1e6).padStart(6, '0');
  const made = withCheckDigit(`7XTLD0A10RK${serial}`);
  if (!made.ok) throw new Error(JSON.stringify(made.findings));
  return { vin: made.vin, year: 2024, make: 'Testmake', model: 'Testmodel', engine: '2.0 L', odometer: 52000 };
}

async function runService() {
  const agent = new http.Agent({ keepAlive: true, maxSockets: job.tablets.length });
  const headers = job.headers;
  const times = [];
  const setups = [];
  const errors = {};
  let readings = 0;
  let jobs = 0;
  let concluded = 0;
  let measuring = false;
  let stop = false;
  const sleep = (ms) => new Promise((r) => setTimeout(r, Math.max(0, ms)));
  const count = (what) => (errors[what] = (errors[what] ?? 0) + 1);
  const json = async (method, path, body) => {
    const res = await request(agent, job.url, method, path, headers, body === undefined ? undefined : JSON.stringify(body));
    let parsed = {};
    try {
      parsed = JSON.parse(res.text);
    } catch {
      /* an error page */
    }
    return { status: res.status, body: parsed };
  };
  /** A new job: a repair order with one three-wire circuit, a fault drawn for it, and the first test proposed. */
  const newJob = async (index, n) => {
    const ro = await json('POST', '/api/repair-orders', { vehicle: vehicle(job.runTag, index, n), complaint: 'MAP sensor voltage low code, intermittent', codes: ['P0107'] });
    if (ro.status !== 201) return count(`POST repair order ${ro.status} ${ro.body?.error?.code ?? ''}`), undefined;
    const circuit = await json('POST', `/api/repair-orders/${ro.body.id}/circuits`, { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' });
    if (circuit.status !== 201) return count(`POST circuit ${circuit.status}`), undefined;
    const first = await json('GET', `/api/repair-orders/${ro.body.id}/circuits/${circuit.body.id}/diagnosis`);
    if (first.status !== 200) return count(`GET diagnosis ${first.status}`), undefined;
    if (measuring) jobs++;
    return { roId: ro.body.id, circuitId: circuit.body.id, fault: FAULTS[(index * 7 + n) % FAULTS.length], diagnosis: first.body, readings: 0 };
  };
  const tablet = async (_t, index) => {
    let i = 0;
    let n = 0;
    let work;
    // Paced tablets start spread over one period, then keep to a schedule of their own.
    let due = performance.now() + (job.paceMs ? (index / job.tablets.length) * job.paceMs : 0);
    while (!stop) {
      // A job ends when the diagnosis concludes (or gives up); setting up the next one is service work too,
      // but not a reading, so it is neither counted nor timed.
      if (!work || work.diagnosis.status === 'concluded' || !work.diagnosis.nextTest || work.readings >= 25) {
        if (work && work.diagnosis.status === 'concluded' && measuring) concluded++;
        const setupStarted = performance.now();
        work = await newJob(index, n++);
        if (work && measuring) setups.push(performance.now() - setupStarted);
        if (!work) continue;
        if (job.paceMs) due = Math.max(due, performance.now());
      }
      if (job.paceMs) await sleep(due - performance.now());
      if (stop) break;
      const next = work.diagnosis.nextTest;
      const body = {
        circuitId: work.circuitId,
        ...next.request,
        ...modelled(work.fault, next.request),
        ...(next.recheckOf ? { supersedes: next.recheckOf } : {}),
        clientKey: `load-${index}-${String(i).padStart(7, '0')}-${job.runTag}`,
      };
      // Paced: latency counts from when the reading was due, so a late start counts against the service too.
      const started = job.paceMs ? due : performance.now();
      const post = await json('POST', `/api/repair-orders/${work.roId}/measurements?diagnosis=true`, body);
      const done = performance.now();
      due += job.paceMs ?? 0;
      i++;
      work.readings++;
      const answered = post.status === 201 && Array.isArray(post.body.diagnoses) && post.body.diagnoses.length === 1;
      if (answered) work.diagnosis = post.body.diagnoses[0];
      else work = undefined;
      if (!measuring) continue;
      if (!answered) count(`POST reading ${post.status}`);
      else readings++;
      times.push(done - started);
    }
  };
  const all = Promise.all(job.tablets.map(tablet));
  await sleep(job.warmupMs);
  measuring = true;
  const t0 = performance.now();
  await sleep(job.durationMs);
  measuring = false;
  const seconds = (performance.now() - t0) / 1000;
  stop = true;
  await all;
  agent.destroy();
  return { readings, seconds, perSecond: readings / seconds, post: summary(times), setup: summary(setups), errors, jobs, concluded };
}

async function runRaw() {
  const { Client } = require('pg');
  const clients = await Promise.all(
    Array.from({ length: job.clients }, async () => {
      const c = new Client({ connectionString: job.databaseUrl });
      await c.connect();
      return c;
    }),
  );
  const sql = `INSERT INTO "Measurement" ("id", "repairOrderId", "circuitId", "quantity", "at", "against", "location", "connector", "key", "engine",
      "jumpers", "valueEntered", "unitEntered", "valueSi", "overload", "siUnit", "meterOhms", "phase", "note", "clientKey", "takenById", "takenAt")
    VALUES ($1, $2, $3, $4::"Quantity", $5::"ProbePoint", $6::"ProbePoint", $7::"ProbeLocation", $8::"ConnectorState", $9::"KeyState",
      $10::"EngineState", $11::jsonb, $12, $13, $14, $15, $16, $17, $18::"Phase", $19, $20, $21, $22)`;
  const times = [];
  let inserted = 0;
  let measuring = false;
  let stop = false;
  const loop = async (client, index) => {
    const t = job.tablets[index % job.tablets.length];
    let i = 0;
    while (!stop) {
      // The reading shape the test bursts send (job.reading), with a little meter scatter.
      const r = { ...job.reading, value: 4.98 + (i % 5) / 100, clientKey: `raw-${index}-${i}-${job.runTag}` };
      const started = performance.now();
      await client.query(sql, [randomUUID(), t.roId, t.circuitId, r.quantity, r.at, r.against, r.location, r.connector, r.key, r.engine,
        '[]', r.value, r.unit, r.value, false, 'V', 1e7, 'diagnosis', '', r.clientKey, job.takenById, new Date()]);
      i++;
      if (!measuring) continue;
      times.push(performance.now() - started);
      inserted++;
    }
  };
  const all = Promise.all(clients.map(loop));
  await new Promise((r) => setTimeout(r, job.warmupMs));
  measuring = true;
  const t0 = performance.now();
  await new Promise((r) => setTimeout(r, job.durationMs));
  measuring = false;
  const seconds = (performance.now() - t0) / 1000;
  stop = true;
  await all;
  await Promise.all(clients.map((c) => c.end()));
  return { inserted, seconds, perSecond: inserted / seconds, insert: summary(times) };
}

const result = job.mode === 'raw' ? await runRaw() : await runService();
process.stdout.write(JSON.stringify(result) + '\n');
