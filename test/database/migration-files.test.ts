// Reading prisma/migrations: order, checksums and the guards that stop a broken folder early.
import { createHash } from 'node:crypto';
import { afterEach, describe, expect, it } from 'vitest';
import { checksumMatches, migrationChecksum, readMigrations } from '../../src/database';
import { MigrationsFolder } from './migrations-folder';

const folders: MigrationsFolder[] = [];
const folder = (...args: ConstructorParameters<typeof MigrationsFolder>) => {
  const f = new MigrationsFolder(...args);
  folders.push(f);
  return f;
};
afterEach(() => folders.splice(0).forEach((f) => f.remove()));

describe('migration checksums', () => {
  it.each([
    // FIPS 180-4 / FIPS 180-2 Appendix B.1 and B.2 example messages and their SHA-256 digests.
    ['abc', 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'],
    ['abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq', '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'],
    // SHA-256 of the empty message, FIPS 180-4 (NIST CSRC example values).
    ['', 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'],
  ])('hashes %j to the published SHA-256 digest', (text, digest) => {
    expect(migrationChecksum(text)).toBe(digest);
  });

  it('hashes the UTF-8 bytes of the text, not UTF-16 code units', () => {
    const text = "-- 10 MΩ meter\nSELECT 'Ω';\n";
    expect(migrationChecksum(text)).toBe(createHash('sha256').update(Buffer.from(text, 'utf8')).digest('hex'));
    expect(migrationChecksum(text)).not.toBe(createHash('sha256').update(Buffer.from(text, 'utf16le')).digest('hex'));
  });

  it.each([
    { change: 'no change', now: 'CREATE TABLE a (id int);\n', applied: 'CREATE TABLE a (id int);\n', matches: true },
    { change: 'CRLF instead of LF line endings', now: 'CREATE TABLE a (id int);\r\n', applied: 'CREATE TABLE a (id int);\n', matches: true },
    { change: 'LF instead of CRLF line endings', now: 'CREATE TABLE a (id int);\n', applied: 'CREATE TABLE a (id int);\r\n', matches: true },
    { change: 'an edited statement', now: 'CREATE TABLE a (id bigint);\n', applied: 'CREATE TABLE a (id int);\n', matches: false },
    { change: 'an added trailing space', now: 'CREATE TABLE a (id int); \n', applied: 'CREATE TABLE a (id int);\n', matches: false },
  ])('after $change, the applied checksum matching is $matches (line endings tolerated as by Prisma)', ({ now, applied, matches }) => {
    expect(checksumMatches(now, migrationChecksum(applied))).toBe(matches);
  });
});

describe('reading the migrations folder', () => {
  it('takes sub-folders in localeCompare order (not byte order) and ignores plain files', () => {
    const f = folder({ '2_B_second': 'SELECT 2;', '2_a_first': 'SELECT 1;', '1_start': 'SELECT 0;' });
    f.write('3_later', 'SELECT 3;');
    const names = readMigrations(f.dir).map((m) => m.name);
    // Byte order would put "2_B" before "2_a" (0x42 < 0x61); localeCompare puts a before B.
    expect(names).toEqual(['1_start', '2_a_first', '2_B_second', '3_later']);
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)));
  });

  it('records each script with its path and its checksum', () => {
    const f = folder({ '1_init': 'CREATE TABLE t (id int);\n' });
    const [m] = readMigrations(f.dir);
    expect(m).toMatchObject({ name: '1_init', scriptPath: f.scriptPath('1_init'), checksum: migrationChecksum('CREATE TABLE t (id int);\n') });
  });

  it.each([
    ['a folder without migration.sql', () => folder({ '1_ok': 'SELECT 1;' }).addEmptyFolder('2_empty'), 'MIGRATION_SCRIPT_MISSING', /2_empty has no migration\.sql/],
    ['a lock file for another provider', () => folder({ '1_ok': 'SELECT 1;' }, 'provider = "mysql"\n'), 'MIGRATION_PROVIDER_MISMATCH', /provider = "mysql".*expected provider = "postgresql"/],
    ['a lock file without a provider line', () => folder({}, '# nothing here\n'), 'MIGRATION_PROVIDER_MISMATCH', /no provider line/],
  ])('refuses %s', (_label, make, code, message) => {
    const f = make();
    expect(() => readMigrations(f.dir)).toThrow(expect.objectContaining({ code, message: expect.stringMatching(message) }));
  });

  it('accepts a folder without migration_lock.toml, as Prisma does', () => {
    const f = folder({ '1_ok': 'SELECT 1;' }, null);
    expect(readMigrations(f.dir).map((m) => m.name)).toEqual(['1_ok']);
  });

  it('names the folder when the migrations folder does not exist', () => {
    expect(() => readMigrations('/nonexistent/tracebay/migrations')).toThrow(
      expect.objectContaining({ code: 'MIGRATIONS_DIR_UNREADABLE', message: expect.stringContaining('/nonexistent/tracebay/migrations') }),
    );
  });
});
