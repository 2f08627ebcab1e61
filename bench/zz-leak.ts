import { execFile } from 'node:child_process';
import { readFileSync, mkdtempSync } from 'node:fs';
import { promisify } from 'node:util';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { Client } from 'pg';
import { openDatabase } from '../src/database';
import { seedShops, TECH_A } from '../test/support/fixtures';
import { credentialsFor, startService } from '../test/faults/service-process';
import { fixtureUser } from '../test/faults/users';
async function admin(sql: string) { const c = new Client({ connectionString: 'postgresql://postgres@127.0.0.1:5432/postgres' }); await c.connect(); await c.query(sql); await c.end(); }
(async () => {
  const db = 'tracebay_leak'; await admin(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`); await admin(`CREATE DATABASE ${db}`);
  const url = `postgresql://postgres@127.0.0.1:5432/${db}`;
  const d = await openDatabase({ databaseUrl: url, dataDir: mkdtempSync(join(tmpdir(), 'x')), migrationsDir: '/work/main/prisma/migrations', poolSize: 2 });
  await seedShops(d.prisma); await d.close();
  const s = await startService({ databaseUrl: url, env: { TRACEBAY_WRITE_LIMIT: '0', LOG_LEVEL: 'error' }, nodeArgs: process.env.NA ? process.env.NA.split(' ') : [] });
  const headers = await credentialsFor(s.url, fixtureUser(TECH_A));
  const s2 = await startService({ databaseUrl: url, env: { TRACEBAY_WRITE_LIMIT: '0', LOG_LEVEL: 'error' } });
  const tablets = Array.from({ length: 25 }, () => ({ roId: '', circuitId: '' }));
  for (let k = 0; k < 4; k++) {
    const gen = (u: string, tag: string) => promisify(execFile)(process.execPath, [resolve(__dirname, 'load-generator.mjs'), JSON.stringify({ mode: 'service', url: u, headers, tablets, durationMs: 8000, warmupMs: 1000, runTag: `leak${k}${tag}` })], { maxBuffer: 1 << 24 }).then(({ stdout }) => JSON.parse(stdout.trim().split('\n').pop()!));
    const [r, r2] = await Promise.all([gen(s.url, 'a'), gen(s2.url, 'b')]);
    r.perSecond += r2.perSecond;
    const rss = Number(readFileSync(`/proc/${s.pid}/status`, 'utf8').match(/VmRSS:\s+(\d+)/)![1]) / 1024;
    console.log(`round ${k}: ${r.perSecond.toFixed(0)} readings/s, p50 ${r.post.p50.toFixed(0)} ms, service RSS ${rss.toFixed(0)} MB`, JSON.stringify(r.errors));
  }
  await s.kill(); await s2.kill();
})();
