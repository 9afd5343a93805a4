import fs from 'node:fs';
import path from 'node:path';

/** What the lock file in a data folder says about the process holding it. */
export interface LockHolder {
  pid: number;
  purpose: string;
  url?: string;
  since: string;
  /**
   * A key that lets `tutti` commands on this machine ask the running server to do their work.
   * Anyone who can read the data folder can read the database itself, so it grants no more.
   */
  localKey?: string;
}

/** Thrown when another live process holds the data folder. */
export class DataFolderLockedError extends Error {
  constructor(
    readonly holder: LockHolder,
    dataDir: string,
  ) {
    super(
      `The data folder ${dataDir} is in use by ${holder.purpose} (process ${holder.pid}` +
        `${holder.url ? `, ${holder.url}` : ''}, since ${holder.since}). ` +
        'PGlite lets only one process open a data folder; stop that process first, ' +
        'or use the running server through its API.',
    );
  }
}

const lockFileName = 'tutti.lock';

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Reads the lock of a data folder, or undefined when nobody alive holds it. */
export function readLock(dataDir: string): LockHolder | undefined {
  const file = path.join(dataDir, lockFileName);
  try {
    const holder = JSON.parse(fs.readFileSync(file, 'utf8')) as LockHolder;
    return holder.pid !== process.pid && isAlive(holder.pid) ? holder : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Takes the data folder for this process. A lock left by a process that has died is taken
 * over; a live holder makes this throw. The lock file is created exclusively so two starting
 * processes cannot both win.
 */
export function acquireLock(
  dataDir: string,
  purpose: string,
  url?: string,
  localKey?: string,
): () => void {
  fs.mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, lockFileName);
  const holder: LockHolder = {
    pid: process.pid,
    purpose,
    url,
    since: new Date().toISOString(),
    localKey,
  };
  for (let attempt = 0; attempt < 2; attempt += 1) {
    try {
      fs.writeFileSync(file, JSON.stringify(holder), { flag: 'wx', mode: 0o600 });
      let released = false;
      return () => {
        if (released) return;
        released = true;
        try {
          const current = JSON.parse(fs.readFileSync(file, 'utf8')) as LockHolder;
          if (current.pid === process.pid) fs.unlinkSync(file);
        } catch {
          // Already gone: nothing to release.
        }
      };
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EROFS' || code === 'EACCES' || code === 'EPERM') {
        throw new Error(
          `The data folder ${dataDir} cannot be written (${code}): the database lives there and needs to write. Nothing was changed. Make the folder writable, or point TUTTI_DATA_DIR at one that is.`,
        );
      }
      if (code !== 'EEXIST') throw error;
      const existing = readLock(dataDir);
      if (existing) throw new DataFolderLockedError(existing, dataDir);
      fs.rmSync(file, { force: true });
    }
  }
  throw new Error(`Could not take the lock on ${dataDir}.`);
}

/** Rewrites this process's own lock, e.g. once the server knows the port it listens on. */
export function updateLock(dataDir: string, changes: Partial<LockHolder>): void {
  const file = path.join(dataDir, lockFileName);
  const current = JSON.parse(fs.readFileSync(file, 'utf8')) as LockHolder;
  if (current.pid !== process.pid) return;
  fs.writeFileSync(file, JSON.stringify({ ...current, ...changes }), { mode: 0o600 });
}
