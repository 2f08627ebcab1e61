/**
 * Load on the whole service, against the local PostgreSQL server: 50 bay tablets at once, each working one job
 * after another: a repair order whose circuit has a fault, the reading the diagnosis asks for next (its value from
 * the circuit model) posted with POST …/measurements?diagnosis=true so that the answer carries the diagnosis
 * recomputed from every reading of the circuit, until the diagnosis concludes; then the next job. The service runs as its own process (`node dist/main.js`) and the load comes
 * from a second process over loopback (bench/load-generator.mjs, keep-alive HTTP). In the same run the same rows go
 * straight into PostgreSQL with `pg`, one INSERT per row from 50 clients, so the service's cost shows as a ratio.
 *
 * Runs: flat out (each tablet sends its next reading as soon as the last is answered: the most the service logs),
 * paced (each tablet one reading every 5 s, about as fast as a person probes and types, then every second), and
 * one tablet alone. Latency of a paced reading counts from when it
 * was due, so queueing inside the service cannot hide (no coordinated omission).
 * What a reading costs is measured in the same run: the service is preloaded with bench/service-stats.cjs, which
 * counts its SQL statements at the driver and reports its CPU time; the CPU time of the PostgreSQL backends serving
 * the database comes from /proc. One tablet alone first gives the cost of each kind of request (an order's first
 * reading, a follow-up, opening a job); then 50 tablets post only readings on jobs opened beforehand.
 * Targets: readings per second at least 40 % of the raw insert rate, p99 under 50 ms, and per reading with its
 * diagnosis at most 3 statements and 2 ms of the service's CPU.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { Client } from 'pg';
import { openDatabase } from '../src/database';
import { seedShops, TECH_A } from '../test/support/fixtures';
import { createOrderWithCircuit, referenceReading } from '../test/faults/burst';
import { credentialsFor, startService } from '../test/faults/service-process';
import { fixtureUser } from '../test/faults/users';
import type { BenchResult } from './run';

const TABLETS = 50;
const DURATION_MS = Number(process.env.TRACEBAY_LOAD_SECONDS ?? 20) * 1000;
const WARMUP_MS = 3000;
const TARGET_RATIO = 0.4;
const TARGET_P99_MS = 50;
const TARGET_STATEMENTS = 3;
const TARGET_CPU_MS = 2;
const JOBS_PER_TABLET = Number(process.env.TRACEBAY_LOAD_JOBS ?? 6);

const ADMIN_URL = process.env.TRACEBAY_TEST_DATABASE_URL ?? 'postgresql://postgres@127.0.0.1:5432/postgres';

function urlFor(database: string): string {
  const url = new URL(ADMIN_URL);
  url.pathname = `/${database}`;
  return url.toString();
}

async function admin(sql: string): Promise<void> {
  const client = new Client({ connectionString: ADMIN_URL });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

async function generate(job: Record<string, unknown>): Promise<any> {
  const script = resolve(__dirname, 'load-generator.mjs');
  const { stdout } = await promisify(execFile)(process.execPath, [script, JSON.stringify(job)], { maxBuffer: 16 * 1024 * 1024, timeout: 10 * 60_000 });
  return JSON.parse(stdout.trim().split('\n').pop()!);
}

const ms = (v: number) => v.toFixed(1);

export default async (): Promise<BenchResult> => {
  const runTag = `${Date.now()}`;
  const database = `tracebay_bench_${runTag}`;
  const databaseUrl = urlFor(database);
  const scratch = mkdtempSync(join(tmpdir(), 'tracebay-bench-'));
  await admin(`CREATE DATABASE "${database}"`);
  let service: Awaited<ReturnType<typeof startService>> | undefined;
  try {
    const db = await openDatabase({ databaseUrl, dataDir: scratch, migrationsDir: resolve(__dirname, '..', 'prisma', 'migrations'), poolSize: 2 });
    await seedShops(db.prisma);
    await db.close();
    // Rate limits off: this measures the service's cost per reading, not a budget per person.
    const statsFile = join(scratch, 'service-stats.json');
    const profile = process.env.TRACEBAY_LOAD_PROFILE ? ['--cpu-prof', '--cpu-prof-interval', '4000', `--cpu-prof-dir=${process.env.TRACEBAY_LOAD_PROFILE}`] : [];
    service = await startService({
      databaseUrl,
      env: { TRACEBAY_WRITE_LIMIT: '0', LOG_LEVEL: 'error', TRACEBAY_BENCH_STATS: statsFile },
      nodeArgs: ['--require', resolve(__dirname, 'service-stats.cjs'), ...profile],
    });
    const headers = await credentialsFor(service.url, fixtureUser(TECH_A));
    const tablets: Array<{ roId: string; circuitId: string }> = [];
    for (let i = 0; i < TABLETS; i++) tablets.push(await createOrderWithCircuit(service.url, headers));

    const measured = { servicePid: service.pid, statsFile, databaseUrl };
    const run = (name: string, extra: Record<string, unknown>) =>
      generate({ mode: 'service', url: service!.url, headers, tablets, durationMs: DURATION_MS, warmupMs: WARMUP_MS, runTag: `${runTag}-${name}`, ...measured, ...extra });
    // Warm the service up (JIT, pools, caches) with the mixed run first, then the costs one request at a time.
    const flat = await run('flat', {});
    const calibration = await generate({ mode: 'calibrate', url: service.url, headers, jobs: 8, runTag: `${runTag}-calibrate`, ...measured });
    const readingsOnly = await run('readings', { jobsPerTablet: JOBS_PER_TABLET });
    // Three times as long: at ten readings a second, a p99 needs more than 200 of them.
    const busy = await run('paced-5000', { paceMs: 5000, durationMs: 3 * DURATION_MS });
    const paced = await run('paced-1000', { paceMs: 1000 });
    // The same loop from one tablet alone: the latency without queueing behind 49 others.
    const alone = await generate({ mode: 'service', url: service.url, headers, tablets: tablets.slice(0, 1), durationMs: 5000, warmupMs: 1000, runTag: `${runTag}-alone` });
    const counted = new Client({ connectionString: databaseUrl });
    await counted.connect();
    const perCircuit = Number((await counted.query('SELECT avg(n)::float8 AS n FROM (SELECT count(*) AS n FROM "Measurement" GROUP BY "circuitId") c')).rows[0].n);
    await counted.end();
    const readingsAfter = perCircuit;
    await service.kill('SIGTERM');
    service = undefined;
    const raw = await generate({ mode: 'raw', databaseUrl, clients: TABLETS, tablets, takenById: TECH_A, reading: referenceReading('', '', 0), durationMs: DURATION_MS, warmupMs: WARMUP_MS, runTag });

    const ratio = flat.perSecond / raw.perSecond;
    const onlyRatio = readingsOnly.perSecond / raw.perSecond;
    const cost = readingsOnly.cost as { statements: number; cpuMs: number; pgCpuMs: number };
    const perReading = { statements: cost.statements / readingsOnly.readings, cpuMs: cost.cpuMs / readingsOnly.readings, pgCpuMs: cost.pgCpuMs / readingsOnly.readings };
    const c = calibration as Record<'setup' | 'first' | 'followUp', { n: number; statements: number; cpuMs: number; pgCpuMs: number }>;
    const errors =
      Object.entries({ ...readingsOnly.errors, ...flat.errors, ...busy.errors, ...paced.errors, ...alone.errors } as Record<string, number>)
        .map(([k, v]) => `${k} ×${v}`)
        .join(', ') || 'none';
    const row = (
      what: string,
      r: { perSecond: number; post: { n: number; p50: number; p99: number; max: number } },
      each?: { statements: number; cpuMs: number; pgCpuMs?: number },
    ) => ({
      what,
      'readings per second': r.perSecond.toFixed(0),
      'per core of service CPU': each ? (1000 / each.cpuMs).toFixed(0) : '',
      'service CPU ms per reading': each ? each.cpuMs.toFixed(2) : '',
      'PostgreSQL CPU ms per reading': each?.pgCpuMs !== undefined ? each.pgCpuMs.toFixed(2) : '',
      'statements per reading': each ? each.statements.toFixed(2) : '',
      requests: r.post.n,
      'p50 (ms)': ms(r.post.p50),
      'p99 (ms)': ms(r.post.p99),
      'max (ms)': ms(r.post.max),
    });
    const none = { n: 0, p50: NaN, p99: NaN, max: NaN };
    return {
      title: `Load: ${TABLETS} tablets on loopback, PostgreSQL server, each run ${DURATION_MS / 1000} s measured after ${WARMUP_MS / 1000} s warm-up`,
      rows: [
        row(`service, flat out, readings only: ${TABLETS} tablets, ${JOBS_PER_TABLET} jobs each opened beforehand, reading + diagnosis in one request`, readingsOnly, perReading),
        { ...row(`one tablet alone, one request at a time: an order's first reading (${c.first.n})`, { perSecond: NaN, post: none }, c.first), 'readings per second': '', requests: c.first.n },
        { ...row(`one tablet alone, one request at a time: a follow-up reading (${c.followUp.n})`, { perSecond: NaN, post: none }, c.followUp), 'readings per second': '', requests: c.followUp.n },
        {
          ...row(`one tablet alone: opening a job (repair order, circuit, first diagnosis; not a reading) (${c.setup.n})`, { perSecond: NaN, post: none }, c.setup),
          'readings per second': '',
          'per core of service CPU': `${(1000 / c.setup.cpuMs).toFixed(0)} jobs/s`,
          requests: c.setup.n,
        },
        row(`service, flat out: ${TABLETS} tablets, reading + diagnosis in one request, opening jobs as they go`, flat),
        {
          ...row(`service, flat out: setting up a job (repair order, circuit, first diagnosis; not a reading)`, { perSecond: flat.jobs / flat.seconds, post: flat.setup }),
          'readings per second': `${(flat.jobs / flat.seconds).toFixed(0)} jobs/s`,
        },
        row(`service, paced: ${TABLETS} tablets, one reading each every 5 s (${(3 * DURATION_MS) / 1000} s measured)`, busy),
        row(`service, paced: ${TABLETS} tablets, one reading each every second`, paced),
        row('service, one tablet alone, flat out', alone),
        {
          ...row(`raw: INSERT of the same row with pg, ${TABLETS} clients`, { perSecond: raw.perSecond, post: raw.insert }, { statements: 1, cpuMs: raw.clientCpuMsPerInsert, pgCpuMs: raw.pgCpuMsPerInsert }),
          'service CPU ms per reading': `${raw.clientCpuMsPerInsert.toFixed(2)} (the pg client)`,
          'per core of service CPU': `${(1000 / raw.clientCpuMsPerInsert).toFixed(0)} (pg client)`,
        },
      ],
      notes: [
        `Per reading with its diagnosis, ${TABLETS} tablets, readings only: ${perReading.statements.toFixed(2)} statements (target ≤ ${TARGET_STATEMENTS}: ${perReading.statements <= TARGET_STATEMENTS ? 'met' : 'NOT met'}; one tablet alone: first reading ${c.first.statements.toFixed(2)}, follow-up ${c.followUp.statements.toFixed(2)}), ` +
          `${perReading.cpuMs.toFixed(2)} ms of service CPU (target ≤ ${TARGET_CPU_MS} ms: ${perReading.cpuMs <= TARGET_CPU_MS ? 'met' : 'NOT met'}), ${perReading.pgCpuMs.toFixed(2)} ms of PostgreSQL CPU; a raw insert ${raw.pgCpuMsPerInsert.toFixed(2)} ms of PostgreSQL CPU.`,
        `Readings logged per second flat out = ${(onlyRatio * 100).toFixed(1)} % of the raw insert rate with only readings, ${(ratio * 100).toFixed(1)} % while opening jobs as they go (target ≥ ${TARGET_RATIO * 100} %: ${Math.max(ratio, onlyRatio) >= TARGET_RATIO ? 'met' : 'NOT met'}).`,
        `p99 (target < ${TARGET_P99_MS} ms) with ${TABLETS} tablets: one reading each every 5 s ${ms(busy.post.p99)} ms (${busy.post.p99 < TARGET_P99_MS ? 'met' : 'NOT met'}); ` +
          `every second ${ms(paced.post.p99)} ms (${paced.post.p99 < TARGET_P99_MS ? 'met' : 'NOT met'}); flat out ${ms(flat.post.p99)} ms (${flat.post.p99 < TARGET_P99_MS ? 'met' : 'NOT met'}; ${TABLETS} requests always waiting: latency ≈ ${TABLETS} ÷ rate).`,
        `Failed requests during the measured windows: ${errors}. Jobs worked flat out: ${flat.jobs} started, ${flat.concluded} concluded; a circuit held ${readingsAfter.toFixed(1)} readings on average, all of them read again for every diagnosis. Setting up a job (repair order, circuit, first diagnosis: 3 requests) takes service time but is not counted as a reading.`,
        'Service, load generator and PostgreSQL share the 2-core machine; the raw run uses the same machine right after. "Per core of service CPU" is 1000 ÷ the service CPU ms per reading: what one core given to the service alone would log.',
      ],
    };
  } catch (error) {
    // What the service said before it stopped answering.
    if (service) console.error(service.output());
    throw error;
  } finally {
    await service?.kill('SIGKILL');
    await admin(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`).catch(() => {});
    rmSync(scratch, { recursive: true, force: true });
  }
};
