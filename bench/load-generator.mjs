// Load generator for bench/load.bench.ts, run as its own process so that it does not share an event loop (or a
// core's time slices) with the service. Plain Node, no build step. Reads one JSON job from argv[2], prints one
// JSON result line on stdout.
//
//   mode "service": each tablet loops: POST a reading, then GET the circuit's diagnosis (recomputed from every
//                   reading), over keep-alive HTTP/1.1 connections on loopback, one connection per tablet.
//   mode "raw":     each client loops: one INSERT of the same row shape straight into PostgreSQL with pg.
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

/** A back-probed reference reading, key on engine off, with a little meter scatter. */
function reading(circuitId, clientKey, i) {
  return {
    circuitId,
    quantity: 'dc_volts',
    at: 'reference',
    against: 'ground',
    location: 'sensor_connector',
    connector: 'backprobed',
    key: 'on',
    engine: 'off',
    value: 4.98 + (i % 5) / 100,
    unit: 'V',
    clientKey,
  };
}

async function runService() {
  const agent = new http.Agent({ keepAlive: true, maxSockets: job.tablets.length });
  const headers = job.headers;
  const posts = [];
  const gets = [];
  const cycles = [];
  const errors = {};
  let readings = 0;
  let measuring = false;
  const tablet = async (t, index) => {
    let i = 0;
    while (!stop) {
      const key = `load-${index}-${String(i).padStart(7, '0')}-${job.runTag}`;
      const started = performance.now();
      const post = await request(agent, job.url, 'POST', `/api/repair-orders/${t.roId}/measurements`, headers, JSON.stringify(reading(t.circuitId, key, i)));
      const posted = performance.now();
      const diagnosis = await request(agent, job.url, 'GET', `/api/repair-orders/${t.roId}/circuits/${t.circuitId}/diagnosis`, headers);
      const done = performance.now();
      i++;
      if (!measuring) continue;
      if (post.status !== 201) errors[`POST ${post.status}`] = (errors[`POST ${post.status}`] ?? 0) + 1;
      else readings++;
      if (diagnosis.status !== 200) errors[`GET ${diagnosis.status}`] = (errors[`GET ${diagnosis.status}`] ?? 0) + 1;
      posts.push(posted - started);
      gets.push(done - posted);
      cycles.push(done - started);
    }
  };
  let stop = false;
  const all = Promise.all(job.tablets.map(tablet));
  await new Promise((r) => setTimeout(r, job.warmupMs));
  measuring = true;
  const t0 = performance.now();
  await new Promise((r) => setTimeout(r, job.durationMs));
  measuring = false;
  const seconds = (performance.now() - t0) / 1000;
  stop = true;
  await all;
  agent.destroy();
  return { readings, seconds, perSecond: readings / seconds, post: summary(posts), diagnosis: summary(gets), cycle: summary(cycles), errors };
}

async function runRaw() {
  const require = createRequire(import.meta.url);
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
      const r = reading(t.circuitId, `raw-${index}-${i}-${job.runTag}`, i);
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
