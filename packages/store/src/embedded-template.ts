/**
 * New embedded databases from a template: creating one (the engine's initdb, then every
 * migration) takes seconds, copying a folder made that way once takes a fraction of one. The
 * template of this code lives in the user's cache folder (`$XDG_CACHE_HOME/fractile`, else
 * `~/.cache/fractile`; `FRACTILE_TEMPLATE_DIR` names another, `FRACTILE_TEMPLATE=off` turns it
 * off), keyed by the SHA-256 of the engine's version, its start parameters and the text of every
 * migration, so a changed schema makes a new one.
 *
 * The template is made in a folder of its own, closed (a clean shutdown: a checkpoint, nothing
 * left in the WAL to replay) and renamed into place, so concurrent processes never see half of
 * one; a process that loses the race uses the winner's. The copy leaves out the lock files, and
 * every file and folder of it is flushed to the disk (fsync) before the engine opens it, so a
 * crash after the first commit cannot find the base files missing (PostgreSQL documentation,
 * "File System Level Backup": a copy of a cleanly stopped server's data folder is a database).
 */
import { createHash, randomBytes } from 'node:crypto';
import { closeSync, copyFileSync, cpSync, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import path from 'node:path';

export interface TemplateSpec {
  /** what makes databases of this code differ: engine version, start parameters, migrations */
  parts: readonly string[];
  /** creates a new, migrated database in the (absent) folder given and closes it */
  create(folder: string): Promise<void>;
}

const SKIP = new Set(['postmaster.pid', 'fractile.lock']);

function templateRoot(): string | null {
  if (process.env.FRACTILE_TEMPLATE === 'off') return null;
  if (process.env.FRACTILE_TEMPLATE_DIR) return process.env.FRACTILE_TEMPLATE_DIR;
  const cache = process.env.XDG_CACHE_HOME || path.join(homedir(), '.cache');
  return path.join(cache, 'fractile');
}

/** fsync of every file and folder under `dir`, the folder last. */
function syncTree(dir: string): void {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) syncTree(p);
    else syncFile(p);
  }
  syncFile(dir);
}

/** The template folder for `spec`, made now if missing; null when templates are off or cannot be made. */
export async function ensureTemplate(spec: TemplateSpec): Promise<string | null> {
  const root = templateRoot();
  if (!root) return null;
  const key = createHash('sha256').update(spec.parts.join('\u0000')).digest('hex').slice(0, 20);
  const ready = path.join(root, `template-${key}`);
  if (existsSync(path.join(ready, 'PG_VERSION'))) return ready;
  const work = path.join(root, `.making-${key}-${process.pid}-${randomBytes(4).toString('hex')}`);
  try {
    mkdirSync(root, { recursive: true });
    await spec.create(work);
    syncTree(work);
    try {
      renameSync(work, ready);
    } catch {
      // another process put its template in place first: use that one
      if (!existsSync(path.join(ready, 'PG_VERSION'))) return null;
    }
    return ready;
  } catch {
    return null; // no cache folder to write: create the database the slow way
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

/**
 * Marks a copy in progress: written first, removed last. A folder that holds it was left by a
 * process killed while copying; it is emptied and copied again (`copyTemplate`), and the folder
 * check takes it for a new folder rather than "other files".
 */
export const COPY_MARKER = '.fractile-copying';

/** Removes everything in `folder` but the entries named in `keep` (a half-done copy). */
export function clearFolder(folder: string, keep: readonly string[] = []): void {
  for (const name of readdirSync(folder)) if (!keep.includes(name)) rmSync(path.join(folder, name), { recursive: true, force: true });
}

function syncFile(p: string): void {
  const fd = openSync(p, 'r');
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/**
 * Copies the template into the database folder `folder` (new, or left half-copied: its files
 * other than `keep` are removed first) and flushes it to the disk. `PG_VERSION`, which makes the
 * folder a database for the folder check and the engine, is copied last, after everything else
 * is on the disk.
 */
export function copyTemplate(template: string, folder: string, keep: readonly string[] = []): void {
  clearFolder(folder, keep);
  const marker = path.join(folder, COPY_MARKER);
  writeFileSync(marker, `${process.pid}\n`);
  syncFile(marker);
  syncFile(folder);
  cpSync(template, folder, { recursive: true, filter: (src) => !SKIP.has(path.basename(src)) && src !== path.join(template, 'PG_VERSION') });
  syncTree(folder);
  copyFileSync(path.join(template, 'PG_VERSION'), path.join(folder, 'PG_VERSION'));
  syncFile(path.join(folder, 'PG_VERSION'));
  rmSync(marker);
  syncFile(folder);
}
