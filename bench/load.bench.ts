/**
 * Load on the whole service, against the local PostgreSQL server: 50 bay tablets at once, each logging a reading
 * and then fetching the diagnosis recomputed from every reading of its circuit, in a loop. The service runs as its
 * own process (`node dist/main.js`) and the load comes from a second process over loopback
 * (bench/load-generator.mjs, keep-alive HTTP). In the same run the same rows go straight into PostgreSQL with `pg`,
 * one INSERT per row from 50 clients, so the service's cost shows as a ratio.
 * Targets: readings per second at least 40 % of the raw insert rate, and p99 under 50 ms.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { Client } from 'pg';
import { openDatabase } from '../src/database';
import { seedShops, TECH_A } from '../test/support/fixtures';
import { createOrderWithCircuit } from '../test/faults/burst';
import { credentialsFor, startService } from '../test/faults/service-process';
import { fixtureUser } from '../test/faults/users';
import type { BenchResult } from './run';

const TABLETS = 50;
const DURATION_MS = Number(process.env.TRACEBAY_LOAD_SECONDS ?? 20) * 1000;
const WARMUP_MS = 3000;
const TARGET_RATIO = 0.4;
const TARGET_P99_MS = 50;

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
    service = await startService({ databaseUrl, env: { TRACEBAY_WRITE_LIMIT: '0', LOG_LEVEL: 'error' } });
    const headers = await credentialsFor(service.url, fixtureUser(TECH_A));
    const tablets = [];
    for (let i = 0; i < TABLETS; i++) tablets.push(await createOrderWithCircuit(service.url, headers));

    const loaded = await generate({ mode: 'service', url: service.url, headers, tablets, durationMs: DURATION_MS, warmupMs: WARMUP_MS, runTag });
    // The same loop from one tablet alone: the latency without queueing behind 49 others.
    const alone = await generate({ mode: 'service', url: service.url, headers, tablets: tablets.slice(0, 1), durationMs: 5000, warmupMs: 1000, runTag: `${runTag}-alone` });
    const counted = new Client({ connectionString: databaseUrl });
    await counted.connect();
    const stored = Number((await counted.query('SELECT count(*)::int AS n FROM "Measurement"')).rows[0].n);
    await counted.end();
    const readingsAfter = Math.round(stored / TABLETS);
    await service.kill('SIGTERM');
    service = undefined;
    const raw = await generate({ mode: 'raw', databaseUrl, clients: TABLETS, tablets, takenById: TECH_A, durationMs: DURATION_MS, warmupMs: WARMUP_MS, runTag });

    const ratio = loaded.perSecond / raw.perSecond;
    const p99 = Math.max(loaded.post.p99, loaded.diagnosis.p99);
    const errors = Object.entries(loaded.errors as Record<string, number>).map(([k, v]) => `${k} ×${v}`).join(', ') || 'none';
    return {
      title: `Load: ${TABLETS} tablets on loopback, PostgreSQL server, ${DURATION_MS / 1000} s measured after ${WARMUP_MS / 1000} s warm-up`,
      rows: [
        {
          what: 'service: POST reading (stored, then acknowledged)',
          'per second': loaded.perSecond.toFixed(0),
          requests: loaded.post.n,
          'p50 (ms)': ms(loaded.post.p50),
          'p99 (ms)': ms(loaded.post.p99),
          'max (ms)': ms(loaded.post.max),
        },
        {
          what: 'service: GET diagnosis right after (recomputed from every reading)',
          'per second': (loaded.diagnosis.n / loaded.seconds).toFixed(0),
          requests: loaded.diagnosis.n,
          'p50 (ms)': ms(loaded.diagnosis.p50),
          'p99 (ms)': ms(loaded.diagnosis.p99),
          'max (ms)': ms(loaded.diagnosis.max),
        },
        {
          what: 'service: one tablet cycle (reading + diagnosis)',
          'per second': (loaded.cycle.n / loaded.seconds).toFixed(0),
          requests: loaded.cycle.n,
          'p50 (ms)': ms(loaded.cycle.p50),
          'p99 (ms)': ms(loaded.cycle.p99),
          'max (ms)': ms(loaded.cycle.max),
        },
        {
          what: 'one tablet alone: POST reading',
          'per second': alone.perSecond.toFixed(0),
          requests: alone.post.n,
          'p50 (ms)': ms(alone.post.p50),
          'p99 (ms)': ms(alone.post.p99),
          'max (ms)': ms(alone.post.max),
        },
        {
          what: 'one tablet alone: GET diagnosis',
          'per second': (alone.diagnosis.n / alone.seconds).toFixed(0),
          requests: alone.diagnosis.n,
          'p50 (ms)': ms(alone.diagnosis.p50),
          'p99 (ms)': ms(alone.diagnosis.p99),
          'max (ms)': ms(alone.diagnosis.max),
        },
        {
          what: `raw: INSERT of the same row with pg, ${TABLETS} clients`,
          'per second': raw.perSecond.toFixed(0),
          requests: raw.insert.n,
          'p50 (ms)': ms(raw.insert.p50),
          'p99 (ms)': ms(raw.insert.p99),
          'max (ms)': ms(raw.insert.max),
        },
      ],
      notes: [
        `Readings logged per second by the service = ${(ratio * 100).toFixed(1)} % of the raw insert rate (target ≥ ${TARGET_RATIO * 100} %: ${ratio >= TARGET_RATIO ? 'met' : 'NOT met'}); ` +
          `p99 of a request = ${ms(p99)} ms (target < ${TARGET_P99_MS} ms: ${p99 < TARGET_P99_MS ? 'met' : 'NOT met'}).`,
        `Failed requests during the measured window: ${errors}. Each circuit held about ${readingsAfter} readings by the end, all of them read again for every diagnosis.`,
        'Service and load generator share the 2-core machine with PostgreSQL; the raw run uses the same machine right after.',
      ],
    };
  } finally {
    await service?.kill('SIGKILL');
    await admin(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`).catch(() => {});
    rmSync(scratch, { recursive: true, force: true });
  }
};
