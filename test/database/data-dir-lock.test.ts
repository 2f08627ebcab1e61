// The lock file that keeps two processes off one embedded data folder.
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { DATA_DIR_LOCK_FILE, lockDataDir } from '../../src/database';

const dirs: string[] = [];
const children: { kill(): void }[] = [];
const dataDir = () => {
  const d = mkdtempSync(join(tmpdir(), 'tracebay-test-lock-'));
  dirs.push(d);
  return d;
};
afterEach(() => {
  children.splice(0).forEach((c) => c.kill());
  dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true }));
});

const writeLock = (dir: string, pid: number, host = hostname(), token = 'other') =>
  writeFileSync(join(dir, DATA_DIR_LOCK_FILE), JSON.stringify({ pid, hostname: host, token, since: '2026-01-01T00:00:00.000Z' }));

/** A process that is alive while the test runs. */
function liveProcess(): number {
  const child = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)'], { stdio: 'ignore' });
  children.push(child);
  return child.pid!;
}

/** The pid of a process that has already exited. */
async function deadPid(): Promise<number> {
  const child = spawn(process.execPath, ['-e', ''], { stdio: 'ignore' });
  await new Promise((resolve) => child.on('exit', resolve));
  return child.pid!;
}

describe('the data folder lock file', () => {
  it('writes the holder’s pid and removes the file on release', () => {
    const dir = dataDir();
    const lock = lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.path, 'utf8'))).toMatchObject({ pid: process.pid, hostname: hostname() });
    lock.release();
    expect(existsSync(lock.path)).toBe(false);
  });

  it('refuses a second lock in the same process, naming the folder and the pid', () => {
    const dir = dataDir();
    const lock = lockDataDir(dir);
    expect(() => lockDataDir(dir)).toThrow(
      expect.objectContaining({ code: 'DATA_DIR_LOCKED', message: expect.stringContaining(`${dir} is in use by process ${process.pid}`) }),
    );
    lock.release();
  });

  it('refuses a folder held by another live process, naming its pid', () => {
    const dir = dataDir();
    const pid = liveProcess();
    writeLock(dir, pid);
    expect(() => lockDataDir(dir)).toThrow(expect.objectContaining({ code: 'DATA_DIR_LOCKED', details: expect.objectContaining({ holderPid: pid }) }));
  });

  it('treats a holder on another host as alive, since its pid cannot be checked', () => {
    const dir = dataDir();
    writeLock(dir, 1, 'another-bay-tablet');
    expect(() => lockDataDir(dir)).toThrow(expect.objectContaining({ code: 'DATA_DIR_LOCKED', message: expect.stringContaining('another-bay-tablet') }));
  });

  it.each([
    ['a pid that has exited', async (dir: string) => writeLock(dir, await deadPid())],
    ['an empty file', async (dir: string) => writeFileSync(join(dir, DATA_DIR_LOCK_FILE), '')],
    // A container restarted with node as process 1: the stale lock names the pid this process has now.
    ['an earlier run with this process’s own pid', async (dir: string) => writeLock(dir, process.pid, hostname(), 'earlier-run')],
  ])('takes over a stale lock left by %s', async (_label, leave) => {
    const dir = dataDir();
    await leave(dir);
    const lock = lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.path, 'utf8'))).toMatchObject({ pid: process.pid });
    lock.release();
  });

  it('leaves a lock that another process took over in place when releasing', () => {
    const dir = dataDir();
    const lock = lockDataDir(dir);
    const pid = liveProcess();
    writeLock(dir, pid);
    lock.release();
    expect(JSON.parse(readFileSync(join(dir, DATA_DIR_LOCK_FILE), 'utf8'))).toMatchObject({ pid });
  });
});
