/**
 * Prepares an embedded database folder for opening: creates it on first use, refuses a folder
 * that holds other files but no database, holds it for this process (folder-lock.ts), and deals
 * with a folder this process cannot write:
 *   - a reading command (`readOnly`) opens a temporary copy instead (the engine writes to its
 *     folder even to read — it replays the WAL at start and checkpoints at close — so it cannot
 *     open a read-only folder itself); the copy is taken while the folder is held, so no writer
 *     changes it meanwhile, and is removed when the store closes. It costs the folder's size in
 *     the system's temporary directory;
 *   - a writing command gets a `database_read_only` StoreError.
 * Every failure is a StoreError with a plain message (no stack): a folder that cannot be created
 * names the reason (EACCES, EROFS, ENOTDIR, ENOSPC).
 */
import { accessSync, chmodSync, constants, cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { HOLDER_FILE, lockFolder, type FolderLock } from './folder-lock.ts';
import { COPY_MARKER } from './embedded-template.ts';
import { StoreError } from './store-error.ts';

export interface PreparedFolder {
  /** the folder to open: the one given, or a temporary copy of it */
  path: string;
  /** true when `path` is a temporary copy of a read-only folder */
  copy: boolean;
  dispose(): Promise<void>;
}

export interface FolderOptions {
  readOnly?: boolean;
  waitMs?: number;
}

const reason = (e: unknown) => {
  const code = (e as { code?: string }).code;
  const why: Record<string, string> = { EACCES: 'permission denied', EPERM: 'not permitted', EROFS: 'read-only file system', ENOTDIR: 'a part of the path is a file', ENOSPC: 'no space left', EEXIST: 'a file of that name exists' };
  return code ? `${why[code] ?? (e as Error).message} (${code})` : (e as Error).message;
};

function writable(p: string): boolean {
  try {
    accessSync(p, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

/** Makes every file and folder of a copy writable by its owner (the copy keeps the modes). */
function ownerWritable(dir: string): void {
  chmodSync(dir, statSync(dir).mode | 0o700);
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) ownerWritable(p);
    else chmodSync(p, statSync(p).mode | 0o600);
  }
}

export async function prepareFolder(folder: string, opts: FolderOptions = {}): Promise<PreparedFolder> {
  if (!existsSync(folder)) {
    try {
      mkdirSync(folder, { recursive: true });
    } catch (e) {
      throw new StoreError('database_unavailable', `cannot create the database folder ${folder}: ${reason(e)}`, { cause: e });
    }
  }
  let entries: string[];
  try {
    if (!statSync(folder).isDirectory()) throw new StoreError('not_a_database', `${folder} is a file, not a database folder`);
    entries = readdirSync(folder);
  } catch (e) {
    if (e instanceof StoreError) throw e;
    throw new StoreError('database_unavailable', `cannot read the database folder ${folder}: ${reason(e)}`, { cause: e });
  }
  // a copy of the template left half done by a killed process counts as new (open-store.ts redoes it)
  if (entries.some((f) => f !== HOLDER_FILE) && !entries.includes('PG_VERSION') && !entries.includes(COPY_MARKER))
    throw new StoreError('not_a_database', `${folder} holds other files but no database (no PG_VERSION): give an empty or new folder, or an existing database folder`);
  const control = path.join(folder, 'global', 'pg_control');
  const canWrite = writable(folder) && (!existsSync(control) || writable(control));
  if (!canWrite && !opts.readOnly)
    throw new StoreError('database_read_only', `the database folder ${folder} is read-only: this command writes to the database; reading commands (tests, properties, report) work on a read-only folder`);

  let lock: FolderLock | null = null;
  try {
    lock = await lockFolder(folder, { waitMs: opts.waitMs });
  } catch (e) {
    // a read-only folder where only the holder-file lock is available: nothing can write it here
    if (e instanceof StoreError || canWrite) throw e;
  }
  if (canWrite) return { path: folder, copy: false, dispose: async () => lock?.release() };
  const tmp = mkdtempSync(path.join(tmpdir(), 'fractile-ro-'));
  const copy = path.join(tmp, 'db');
  try {
    cpSync(folder, copy, { recursive: true, filter: (src) => ![HOLDER_FILE, 'postmaster.pid'].includes(path.basename(src)) });
    ownerWritable(copy);
  } catch (e) {
    rmSync(tmp, { recursive: true, force: true });
    await lock?.release();
    throw new StoreError('database_unavailable', `the database folder ${folder} is read-only and could not be copied to read it: ${reason(e)}`, { cause: e });
  }
  await lock?.release();
  return {
    path: copy,
    copy: true,
    async dispose() {
      rmSync(tmp, { recursive: true, force: true });
    },
  };
}
