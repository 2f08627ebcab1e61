// A refused sign-in must not tell which emails exist by how much work it does (issue: 33.0 vs 28.9 ms median,
// existing vs unknown email). Compared deterministically: the database statements a refusal issues are the same,
// in the same order, for a wrong password, an unknown email, an inactive person and a locked account; and the
// password check always verifies an argon2id hash of our own parameters (a dummy stands in for a missing one).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARGON2ID_PARAMS, DUMMY_HASH, hashPassword } from '../../src/modules/auth/secrets';
import { BACKENDS, testDatabase, type TestDatabase } from '../support/db';
import { FIXTURE_PASSWORD, seedShops } from '../support/fixtures';
import { startInstance, type TestApi } from '../support/http';

describe('the dummy hash a sign-in with an unknown email verifies', () => {
  it('is argon2id with the parameters real passwords are hashed with', async () => {
    expect(DUMMY_HASH.startsWith(`$argon2id$v=19$${ARGON2ID_PARAMS}$`)).toBe(true);
    expect((await hashPassword('a fresh password for the check')).split('$').slice(0, 4)).toEqual(DUMMY_HASH.split('$').slice(0, 4));
  });
});

describe.each(BACKENDS)('a refused sign-in does the same work whether or not the email exists, on the %s database', (backend) => {
  let db: TestDatabase;
  let api: TestApi;
  /** Every statement the service sends through Prisma: model and operation, and the shape of its arguments. */
  const statements: string[] = [];

  beforeAll(async () => {
    db = await testDatabase(backend);
    await seedShops(db.prisma);
    await db.prisma.user.update({ where: { email: 'admin@a.test' }, data: { lockedUntil: new Date(Date.now() + 3_600_000) } });
    const spied = db.prisma.$extends({
      query: {
        async $allOperations({ model, operation, args, query }) {
          const shape = args && typeof args === 'object' && !Array.isArray(args) ? Object.keys(args as object).sort().join(',') : typeof args;
          statements.push(`${model ?? '-'}.${operation}(${shape})`);
          return query(args);
        },
      },
    });
    api = await startInstance({ ...db, prisma: spied as unknown as TestDatabase['prisma'] }, { TRACEBAY_SIGN_IN_LIMIT_EMAIL: '0', TRACEBAY_SIGN_IN_LIMIT_IP: '0' });
  });
  afterAll(async () => {
    await api?.close();
    await db?.close();
  });

  const workOf = async (email: string, password: string) => {
    statements.length = 0;
    const res = await api.call('POST', '/api/auth/sign-in', { body: { email, password } });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('sign_in.refused');
    return [...statements];
  };

  it('issues the same statements for a wrong password as for an unknown email, an inactive person and a locked account', async () => {
    const wrongPassword = await workOf('one@a.test', 'not the right one at all');
    expect(wrongPassword.length).toBeGreaterThan(0);
    expect(await workOf('nobody-here@a.test', 'not the right one at all')).toEqual(wrongPassword);
    expect(await workOf('gone@a.test', FIXTURE_PASSWORD)).toEqual(wrongPassword);
    expect(await workOf('admin@a.test', FIXTURE_PASSWORD)).toEqual(wrongPassword);
    // Each again, so that nothing done once (a first-time set-up) hides in the first call.
    expect(await workOf('nobody-else@a.test', 'still not it')).toEqual(wrongPassword);
    expect(await workOf('one@a.test', 'still not it')).toEqual(wrongPassword);
  });

  it('still counts the failures of an existing person towards the lock-out, and nothing for an unknown email', async () => {
    const before = (await db.prisma.user.findUniqueOrThrow({ where: { email: 'two@a.test' } })).failedSignIns;
    await workOf('two@a.test', 'a wrong guess');
    expect((await db.prisma.user.findUniqueOrThrow({ where: { email: 'two@a.test' } })).failedSignIns).toBe(before + 1);
    expect(await db.prisma.user.count({ where: { email: 'nobody-here@a.test' } })).toBe(0);
  });
});
