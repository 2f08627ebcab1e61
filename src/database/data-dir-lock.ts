// A lock file beside the embedded database: PGlite itself lets two processes open one folder
// and corrupt it. The file names its holder; a lock left by a dead process is taken over.
import { randomUUID } from 'node:crypto';
import { linkSync, readFileSync, renameSync, rmSync, unlinkSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { DatabaseError, describeDriverError } from './errors';

export const DATA_DIR_LOCK_FILE = 'tracebay-db.lock';

interface LockContent {
  pid: number;
  hostname: string;
  token: string;
  since: string;
}

export interface DataDirLock {
  readonly path: string;
  release(): void;
}

/** Tokens of the locks this process holds now: a lock naming our own pid with another token is a previous run's. */
const heldTokens = new Set<string>();

export function lockDataDir(dataDir: string): DataDirLock {
  const path = join(dataDir, DATA_DIR_LOCK_FILE);
  const mine: LockContent = { pid: process.pid, hostname: hostname(), token: randomUUID(), since: new Date().toISOString() };
  for (let attempt = 0; attempt < 5; attempt++) {
    if (tryCreate(path, mine, dataDir)) return holdLock(path, mine);
    const holder = readLock(path);
    if (holder === 'missing') continue;
    if (holder !== 'unreadable' && isAlive(holder)) throw lockedError(dataDir, path, holder);
    takeOverStale(path, dataDir);
  }
  throw new DatabaseError(
    'DATA_DIR_UNUSABLE',
    `Could not take the lock file ${path} for data folder ${dataDir}: other processes keep replacing it.`,
    { dataDir, lockPath: path },
  );
}

/** Writes the content to a private file, then links it into place: the lock never exists half-written. */
function tryCreate(path: string, content: LockContent, dataDir: string): boolean {
  const draft = `${path}.${content.token}.tmp`;
  try {
    writeFileSync(draft, JSON.stringify(content), { flag: 'wx' });
    linkSync(draft, path);
    return true;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw new DatabaseError(
      'DATA_DIR_UNUSABLE',
      `Cannot create the lock file ${path} in data folder ${dataDir}: ${describeDriverError(error)}`,
      { dataDir, lockPath: path },
      { cause: error },
    );
  } finally {
    rmSync(draft, { force: true });
  }
}

function readLock(path: string): LockContent | 'missing' | 'unreadable' {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'ENOENT' ? 'missing' : 'unreadable';
  }
  try {
    const parsed = JSON.parse(text) as Partial<LockContent>;
    return typeof parsed.pid === 'number' && typeof parsed.hostname === 'string'
      ? (parsed as LockContent)
      : 'unreadable';
  } catch {
    return 'unreadable';
  }
}

function isAlive(holder: LockContent): boolean {
  // A pid on another machine (shared folder) cannot be checked: assume it is alive.
  if (holder.hostname !== hostname()) return true;
  // Our own pid: held by us now, or left by an earlier run that had the same pid (a container restarted with node
  // as process 1 always has pid 1).
  if (holder.pid === process.pid) return heldTokens.has(holder.token);
  try {
    process.kill(holder.pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Moves the stale file aside first, so that two processes taking over at once cannot both win. */
function takeOverStale(path: string, dataDir: string): void {
  const aside = `${path}.stale-${process.pid}-${randomUUID()}`;
  try {
    renameSync(path, aside);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return;
    throw new DatabaseError('DATA_DIR_UNUSABLE', `Cannot replace the stale lock file ${path}: ${describeDriverError(error)}`, {
      dataDir,
      lockPath: path,
    });
  }
  const moved = readLock(aside);
  if (moved !== 'missing' && moved !== 'unreadable' && isAlive(moved)) {
    // Another process took the lock over between our read and our rename: give it back.
    try {
      linkSync(aside, path);
    } catch {
      /* the holder's file is lost only if a third process raced in; it then holds its own */
    }
    unlinkSync(aside);
    throw lockedError(dataDir, path, moved);
  }
  unlinkSync(aside);
}

function holdLock(path: string, mine: LockContent): DataDirLock {
  let released = false;
  heldTokens.add(mine.token);
  const release = (): void => {
    if (released) return;
    released = true;
    heldTokens.delete(mine.token);
    process.removeListener('exit', release);
    const current = readLock(path);
    if (current !== 'missing' && current !== 'unreadable' && current.token === mine.token) {
      try {
        unlinkSync(path);
      } catch {
        /* already gone */
      }
    }
  };
  process.on('exit', release);
  return { path, release };
}

function lockedError(dataDir: string, path: string, holder: LockContent): DatabaseError {
  const where = holder.hostname === hostname() ? '' : ` on host ${holder.hostname}`;
  return new DatabaseError(
    'DATA_DIR_LOCKED',
    `The data folder ${dataDir} is in use by process ${holder.pid}${where} (since ${holder.since}). ` +
      `Stop that process or choose another data folder; delete ${path} only if that process is gone.`,
    { dataDir, lockPath: path, holderPid: holder.pid, holderHost: holder.hostname },
  );
}
