/**
 * `npm run user -- create-admin`: the first admin of a new install, against a fresh PostgreSQL test database.
 * The password comes on stdin; a weak one is refused with the NIST SP 800-63B §5.1.1.2 rule named.
 */
import { spawnSync } from 'node:child_process';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { startApi, type TestApi } from '../support/http';

const ROOT = resolve(__dirname, '..', '..');

function runUser(args: string[], password: string, databaseUrl: string) {
  return spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/user.ts', ...args], {
    cwd: ROOT,
    input: `${password}\n`,
    encoding: 'utf8',
    env: { ...process.env, DATABASE_URL: databaseUrl, LOG_LEVEL: 'error' },
    timeout: 60_000,
  });
}

describe.runIf(BACKENDS.includes('postgresql'))('the user command on a new install', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi('postgresql', { fixtures: false });
  }, 60_000);
  afterAll(async () => api?.close());

  const args = ['create-admin', '--shop', 'Brindle Lane Garage', '--email', 'Marta@Brindle.test', '--name', 'Marta Quell'];

  it.each([
    ['too short (shop policy 12, §5.1.1.2 at least 8)', 'lamp post 7', 'password.too_short'],
    ['commonly used (§5.1.1.2)', 'qwerty123456', 'password.commonly_used'],
    ['the shop name in it (§5.1.1.2 context-specific words)', 'brindle forever and ever', 'password.context_word'],
  ])('refuses a password that is %s, says which rule, and creates nobody', async (_what, password, code) => {
    const run = runUser(args, password, api.db.url!);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain(code);
    expect(run.stderr).toContain('800-63B §5.1.1.2');
    expect(await api.db.prisma.user.count()).toBe(0);
  });

  it('refuses a missing option with the usage line', () => {
    const run = runUser(['create-admin', '--shop', 'X'], 'ferry lights over wet tarmac', api.db.url!);
    expect(run.status).toBe(64);
    expect(run.stderr).toContain('--email is required');
    expect(run.stderr).toContain('usage: npm run user');
  });

  it('creates the shop and its admin, who can then sign in to it', async () => {
    const run = runUser(args, 'ferry lights over wet tarmac', api.db.url!);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    expect(run.stdout).toContain('Created admin Marta Quell <marta@brindle.test>');
    const signIn = await api.call('POST', '/api/auth/sign-in', { body: { email: 'marta@brindle.test', password: 'ferry lights over wet tarmac' } });
    expect(signIn.body.user).toMatchObject({ role: 'admin', name: 'Marta Quell' });
    const me = await api.call('GET', '/api/me', { headers: { authorization: `Bearer ${signIn.body.token}` } });
    expect(me.body.shop.name).toBe('Brindle Lane Garage');
    expect(runUser(args, 'ferry lights over wet tarmac', api.db.url!).status).toBe(1); // the email is taken now
  });
});
