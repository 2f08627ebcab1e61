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
//                   With jobsPerTablet, the jobs are opened before the measured window and the window ends when the
//                   first tablet has worked through its own: only readings are measured.
//   mode "calibrate": one tablet alone works `jobs` jobs one request at a time and reads the service's statements and
//                   CPU around each request: the cost of an order's first reading, of a follow-up, of opening a job.
//   mode "raw":     each client loops: one INSERT of the same row shape (job.reading) straight into PostgreSQL with pg.
//
// With job.servicePid and job.statsFile (the service preloaded with bench/service-stats.cjs) a measured window also
// reports the service's CPU time and SQL statements; with job.databaseUrl, the CPU time of the PostgreSQL backends
// serving that database (Linux /proc).
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
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

function request(agent, url, method, path, headers, body, retried = false) {
  return new Promise((resolve, reject) => {
    const req = http.request(url + path, { method, agent, headers: { ...headers, ...(body ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) } : {}) } }, (res) => {
      const chunks = [];
      res.on('data', (c) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode, text: Buffer.concat(chunks).toString() }));
    });
    req.setTimeout(30_000, () => req.destroy(new Error('timeout')));
    req.on('error', (error) => {
      // A kept-alive connection the server closed after idling (5 s) just as this request went out: send it again
      // once on a new one (readings carry a client key, so a repeat is stored once).
      if (!retried && req.reusedSocket && error.code === 'ECONNRESET') resolve(request(agent, url, method, path, headers, body, true));
      else reject(error);
    });
    req.end(body);
  });
}

const require = createRequire(import.meta.url);
const CLOCK_TICKS_PER_MS = 100 / 1000; // USER_HZ, 100 on Linux

/** CPU ms used so far by the PostgreSQL backends connected to the job's database (not counting our own). */
async function backendCpuMs(client) {
  const { rows } = await client.query('SELECT pid FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()');
  let ticks = 0;
  for (const { pid } of rows) {
    try {
      const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
      ticks += Number(fields[11]) + Number(fields[12]); // utime, stime
    } catch {
      /* the backend ended meanwhile */
    }
  }
  return { ms: ticks / CLOCK_TICKS_PER_MS, backends: rows.length };
}

let statsClient;
/** The service's statements and CPU so far (and PostgreSQL's), or undefined without the stats preload. */
async function snapshot() {
  if (!job.servicePid || !job.statsFile) return undefined;
  const before = (() => {
    try {
      return JSON.parse(readFileSync(job.statsFile, 'utf8')).seq;
    } catch {
      return 0;
    }
  })();
  process.kill(job.servicePid, 'SIGUSR2');
  let stats;
  for (let i = 0; i < 400; i++) {
    try {
      stats = JSON.parse(readFileSync(job.statsFile, 'utf8'));
      if (stats.seq > before) break;
    } catch {
      /* being written */
    }
    await new Promise((r) => setTimeout(r, 5));
  }
  let pgCpu;
  if (job.databaseUrl) {
    if (!statsClient) {
      const { Client } = require('pg');
      statsClient = new Client({ connectionString: job.databaseUrl });
      await statsClient.connect();
    }
    pgCpu = await backendCpuMs(statsClient);
  }
  return { statements: stats.statements, cpuMs: stats.cpuMs, pgCpuMs: pgCpu?.ms };
}

function delta(a, b) {
  if (!a || !b) return undefined;
  return { statements: b.statements - a.statements, cpuMs: b.cpuMs - a.cpuMs, pgCpuMs: a.pgCpuMs === undefined ? undefined : b.pgCpuMs - a.pgCpuMs };
}

// The circuit model (built into dist/ by the benchmark before it starts the service) gives each job's readings.
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
  /** The next reading a job's diagnosis asks for, as the tablet posts it. */
  const readingFor = (work, index, i) => {
    const next = work.diagnosis.nextTest;
    return {
      circuitId: work.circuitId,
      ...next.request,
      ...modelled(work.fault, next.request),
      ...(next.recheckOf ? { supersedes: next.recheckOf } : {}),
      clientKey: `load-${index}-${String(i).padStart(7, '0')}-${job.runTag}`,
    };
  };
  const finished = (work) => !work || work.diagnosis.status === 'concluded' || !work.diagnosis.nextTest || work.readings >= 25;
  // With jobsPerTablet: every job opened first, then only readings, measured until the first tablet runs out.
  const queues = job.jobsPerTablet
    ? await Promise.all(
        job.tablets.map(async (_t, index) => {
          const queue = [];
          for (let n = 0; n < job.jobsPerTablet; n++) {
            const opened = await newJob(index, n);
            if (opened) queue.push(opened);
          }
          return queue;
        }),
      )
    : undefined;
  let start;
  let end;
  let t0;
  let t1;
  const stopMeasuring = async () => {
    if (!measuring) return;
    measuring = false;
    t1 = performance.now();
    end = await snapshot();
  };
  const tablet = async (_t, index) => {
    let i = 0;
    let n = queues ? job.jobsPerTablet : 0;
    let work;
    // Paced tablets start spread over one period, then keep to a schedule of their own.
    let due = performance.now() + (job.paceMs ? (index / job.tablets.length) * job.paceMs : 0);
    while (!stop) {
      // A job ends when the diagnosis concludes (or gives up); setting up the next one is service work too,
      // but not a reading, so it is neither counted nor timed.
      if (finished(work)) {
        if (work && work.diagnosis.status === 'concluded' && measuring) concluded++;
        if (queues) {
          work = queues[index].shift();
          if (!work) {
            await stopMeasuring();
            break;
          }
        } else {
          const setupStarted = performance.now();
          work = await newJob(index, n++);
          if (work && measuring) setups.push(performance.now() - setupStarted);
          if (!work) continue;
        }
        if (job.paceMs) due = Math.max(due, performance.now());
      }
      if (job.paceMs) await sleep(due - performance.now());
      if (stop) break;
      const body = readingFor(work, index, i);
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
  if (queues) {
    start = await snapshot();
    measuring = true;
    t0 = performance.now();
    stop = false;
    await Promise.all(job.tablets.map(tablet));
    await stopMeasuring();
  } else {
    const all = Promise.all(job.tablets.map(tablet));
    await sleep(job.warmupMs);
    start = await snapshot();
    measuring = true;
    t0 = performance.now();
    await sleep(job.durationMs);
    await stopMeasuring();
    stop = true;
    await all;
  }
  const seconds = (t1 - t0) / 1000;
  agent.destroy();
  return { readings, seconds, perSecond: readings / seconds, post: summary(times), setup: summary(setups), errors, jobs, concluded, cost: delta(start, end) };
}

/** One tablet alone, one request at a time: what each kind of request costs the service and PostgreSQL. */
async function runCalibrate() {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  const json = async (method, path, body) => {
    const res = await request(agent, job.url, method, path, job.headers, body === undefined ? undefined : JSON.stringify(body));
    return { status: res.status, body: JSON.parse(res.text || '{}') };
  };
  const kinds = { setup: [], first: [], followUp: [] };
  for (let n = 0; n < job.jobs; n++) {
    let before = await snapshot();
    const ro = await json('POST', '/api/repair-orders', { vehicle: vehicle(job.runTag, 999, n), complaint: 'MAP sensor voltage low code, intermittent', codes: ['P0107'] });
    const circuit = await json('POST', `/api/repair-orders/${ro.body.id}/circuits`, { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' });
    let diagnosis = (await json('GET', `/api/repair-orders/${ro.body.id}/circuits/${circuit.body.id}/diagnosis`)).body;
    let after = await snapshot();
    kinds.setup.push(delta(before, after));
    const fault = FAULTS[n % FAULTS.length];
    for (let i = 0; diagnosis.nextTest && diagnosis.status !== 'concluded' && i < 25; i++) {
      const next = diagnosis.nextTest;
      const body = { circuitId: circuit.body.id, ...next.request, ...modelled(fault, next.request), ...(next.recheckOf ? { supersedes: next.recheckOf } : {}) };
      before = await snapshot();
      const post = await json('POST', `/api/repair-orders/${ro.body.id}/measurements?diagnosis=true`, body);
      after = await snapshot();
      if (post.status !== 201) throw new Error(`calibration reading answered ${post.status}: ${JSON.stringify(post.body)}`);
      (i === 0 ? kinds.first : kinds.followUp).push(delta(before, after));
      diagnosis = post.body.diagnoses[0];
    }
  }
  agent.destroy();
  const mean = (list, field) => list.reduce((a, c) => a + c[field], 0) / list.length;
  const out = {};
  for (const [kind, list] of Object.entries(kinds)) {
    out[kind] = { n: list.length, statements: mean(list, 'statements'), cpuMs: mean(list, 'cpuMs'), pgCpuMs: list[0]?.pgCpuMs === undefined ? undefined : mean(list, 'pgCpuMs') };
  }
  return out;
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
  const pgBefore = await backendCpuMs(clients[0]);
  const ownBefore = process.cpuUsage();
  measuring = true;
  const t0 = performance.now();
  await new Promise((r) => setTimeout(r, job.durationMs));
  measuring = false;
  const seconds = (performance.now() - t0) / 1000;
  const own = process.cpuUsage(ownBefore);
  // The client used for the look counts itself out; its own insert loop is a backend like the others.
  const pgAfter = await backendCpuMs(clients[0]);
  stop = true;
  await all;
  await Promise.all(clients.map((c) => c.end()));
  return {
    inserted,
    seconds,
    perSecond: inserted / seconds,
    insert: summary(times),
    pgCpuMsPerInsert: (pgAfter.ms - pgBefore.ms) / inserted,
    clientCpuMsPerInsert: (own.user + own.system) / 1000 / inserted,
  };
}

const result = job.mode === 'raw' ? await runRaw() : job.mode === 'calibrate' ? await runCalibrate() : await runService();
await statsClient?.end();
process.stdout.write(JSON.stringify(result) + '\n');
