import { closeSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';

export class DataDirLockedError extends Error {}

function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * PGlite's files belong to one process: two processes on one directory corrupt it. The lock is a
 * file holding the owner's pid, created exclusively; a lock left by a process that died is taken over.
 */
export function lockDataDir(dir: string, label = 'the Lashline server') {
  mkdirSync(dir, { recursive: true });
  const file = join(dir, 'lashline.lock');
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      // Readable by this OS user only: it will hold the local job token.
      const fd = openSync(file, 'wx', 0o600);
      writeSync(fd, JSON.stringify({ pid: process.pid, label, since: new Date().toISOString() }));
      closeSync(fd);
      let released = false;
      return () => {
        if (released) return;
        released = true;
        rmSync(file, { force: true });
      };
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
      let owner: { pid?: number; label?: string } = {};
      try {
        owner = JSON.parse(readFileSync(file, 'utf8'));
      } catch {
        // An unreadable lock file is treated as left behind.
      }
      if (owner.pid && owner.pid !== process.pid && alive(owner.pid))
        throw new DataDirLockedError(
          `The data directory ${dir} is in use by ${owner.label ?? 'another process'} (pid ${owner.pid}). ` +
            'Only one process may open an embedded database. Stop it first, or use its admin page or API to run jobs.',
        );
      rmSync(file, { force: true });
    }
  }
  throw new DataDirLockedError(`Could not take the lock on ${dir}. Try again.`);
}

/** Adds facts to the lock (the port the owner serves on), for command-line tools. */
export function updateLock(dir: string, info: Record<string, unknown>) {
  const file = join(dir, 'lashline.lock');
  const owner = JSON.parse(readFileSync(file, 'utf8'));
  writeFileSync(file, JSON.stringify({ ...owner, ...info }), { mode: 0o600 });
}

export function lockOwner(dir: string): { pid: number; port?: number; host?: string; jobToken?: string } | null {
  try {
    const owner = JSON.parse(readFileSync(join(dir, 'lashline.lock'), 'utf8'));
    return owner.pid && alive(owner.pid) ? owner : null;
  } catch {
    return null;
  }
}
