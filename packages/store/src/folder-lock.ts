/**
 * One process at a time on an embedded database folder.
 *
 * The embedded engine (PGlite) is PostgreSQL in single-user mode inside this process: it keeps
 * its buffers and its view of the files in its own memory and writes a checkpoint when it closes.
 * Two processes on one folder therefore overwrite each other's pages and lose committed data, and
 * that holds for a process that only reads as well (it still checkpoints on close and may replay
 * the WAL at start). So every process that opens a folder holds it exclusively — readers wait for
 * writers like writers do — for as long as the store is open.
 *
 * Exclusion (Linux): a listening Unix socket in the abstract namespace named after the folder's
 * real path (unix(7)). The kernel owns it: a second process gets EADDRINUSE, and a process that
 * dies, even by SIGKILL, releases it at once, so there is no stale lock to judge or take over.
 * Elsewhere (or where that socket cannot be made): the holder file itself, created exclusively
 * (O_EXCL); a holder file whose process is gone (same host, `kill(pid, 0)` fails with ESRCH) is
 * stale and is taken over, after re-reading it unchanged, by removing it and creating ours — two
 * processes that find the same stale file at the same instant can still race there, which the
 * socket does not.
 *
 * The holder file `fractile.lock` in the folder names the process (pid, host, command, since) for
 * the message a second process prints; on Linux it is written after the socket is held and is
 * only information. Written by hand: the lock-file packages at hand judge staleness by age (a
 * timer refreshing the file's mtime), which a long synchronous step of the engine can outlast.
 *
 * `waitMs` 0 fails at once with a `database_busy` StoreError; more waits that long, polling.
 */
import { createHash } from 'node:crypto';
import { readFileSync, realpathSync, unlinkSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import net from 'node:net';
import path from 'node:path';
import { StoreError } from './store-error.ts';

export const HOLDER_FILE = 'fractile.lock';

export interface LockHolder {
  pid: number;
  host: string;
  command: string;
  since: string;
}

export interface FolderLock {
  /** how the lock is held */
  kind: 'socket' | 'file';
  release(): Promise<void>;
}

export interface LockOptions {
  /** how long to wait for another holder (ms); 0: fail at once */
  waitMs?: number;
  /** forces the holder-file lock (for tests of it); default: the socket where it works */
  mechanism?: 'socket' | 'file';
}

function me(): LockHolder {
  const cmd = [path.basename(process.argv[1] ?? 'node'), ...process.argv.slice(2, 3)].join(' ');
  return { pid: process.pid, host: hostname(), command: cmd, since: new Date().toISOString() };
}

function readHolder(file: string): LockHolder | null {
  try {
    const h = JSON.parse(readFileSync(file, 'utf8')) as LockHolder;
    return typeof h.pid === 'number' ? h : null;
  } catch {
    return null;
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as { code?: string }).code === 'EPERM';
  }
}

/** Listens on the abstract socket; 'busy' when another process holds it, an Error when sockets of this kind are not available. */
function listenAbstract(name: string): Promise<net.Server | 'busy' | Error> {
  return new Promise((resolve) => {
    const server = net.createServer((s) => s.destroy());
    server.once('error', (e: NodeJS.ErrnoException) => resolve(e.code === 'EADDRINUSE' ? 'busy' : e));
    server.listen({ path: '\u0000' + name, exclusive: true }, () => {
      server.unref();
      resolve(server);
    });
  });
}

/** Tries the holder-file lock once: true when it is ours now. */
function tryFile(file: string, holder: LockHolder): boolean {
  try {
    writeFileSync(file, JSON.stringify(holder), { flag: 'wx' });
    return true;
  } catch (e) {
    if ((e as { code?: string }).code !== 'EEXIST') throw e;
  }
  const seen = readFileSync(file, 'utf8');
  const other = readHolder(file);
  if (other && other.host === holder.host && !alive(other.pid) && readFileSync(file, 'utf8') === seen) {
    unlinkSync(file);
    return tryFile(file, holder);
  }
  return false;
}

function busy(folder: string, file: string, waitedMs: number): StoreError {
  const h = readHolder(file);
  const who = h ? `process ${h.pid} (${h.command}${h.host !== hostname() ? ` on ${h.host}` : ''}, since ${h.since})` : 'another process';
  const waited = waitedMs > 0 ? ` (waited ${(waitedMs / 1000).toFixed(0)} s)` : '';
  return new StoreError('database_busy', `the database folder ${folder} is in use by ${who}${waited}; an embedded database serves one process at a time: try again when it has finished (the command line waits with --wait SECONDS)`);
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Holds `folder` (which must exist) for this process; throws a `database_busy` StoreError. */
export async function lockFolder(folder: string, opts: LockOptions = {}): Promise<FolderLock> {
  const file = path.join(folder, HOLDER_FILE);
  const holder = me();
  const waitMs = Math.max(0, opts.waitMs ?? 0);
  const t0 = Date.now();
  const name = 'fractile-db-' + createHash('sha256').update(realpathSync(folder)).digest('hex').slice(0, 40);
  let mechanism = opts.mechanism ?? (process.platform === 'linux' ? 'socket' : 'file');
  for (;;) {
    if (mechanism === 'socket') {
      const got = await listenAbstract(name);
      if (got instanceof Error) mechanism = 'file';
      else if (got !== 'busy') {
        try {
          writeFileSync(file, JSON.stringify(holder));
        } catch {
          // a read-only folder: the socket still excludes others, only the information is missing
        }
        return {
          kind: 'socket',
          async release() {
            if (readHolder(file)?.pid === holder.pid) {
              try {
                unlinkSync(file);
              } catch {
                // already gone
              }
            }
            await new Promise<void>((r) => got.close(() => r()));
          },
        };
      }
    }
    if (mechanism === 'file' && tryFile(file, holder)) {
      return {
        kind: 'file',
        async release() {
          if (readHolder(file)?.pid === holder.pid) unlinkSync(file);
        },
      };
    }
    const waited = Date.now() - t0;
    if (waited >= waitMs) throw busy(folder, file, waited);
    await sleep(Math.min(100, waitMs - waited));
  }
}
