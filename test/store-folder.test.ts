/**
 * The embedded database folder: held by one process at a time (a second one is told who holds it,
 * or waits), released by a process that is killed, a stale holder file of a dead process taken
 * over; a folder that is read-only is read through a copy by reading commands and refused by
 * writing ones; a folder that cannot be created, or holds other files, is a plain error.
 */
import { spawn, spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { HOLDER_FILE, lockFolder, openStore, StoreError } from '@fractile/store';

const root = mkdtempSync(path.join(tmpdir(), 'fractile-folder-'));
const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
afterAll(() => spawnSync('rm', ['-rf', root]));

const fresh = (name: string) => {
  const p = path.join(root, name);
  mkdirSync(p, { recursive: true });
  return p;
};

/** A child process that holds the folder and prints "held" (then waits to be killed). */
function holder(folder: string, mechanism: 'socket' | 'file') {
  const code = `import { lockFolder } from '@fractile/store'; await lockFolder(${JSON.stringify(folder)}, { mechanism: '${mechanism}' }); console.log('held'); setInterval(() => {}, 1000);`;
  const child = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', code], { cwd: path.dirname(bin), stdio: ['ignore', 'pipe', 'inherit'] });
  const held = new Promise<void>((resolve, reject) => {
    child.stdout.on('data', (b: Buffer) => b.toString().includes('held') && resolve());
    child.on('exit', (c) => reject(new Error(`holder exited with ${c}`)));
  });
  const exited = new Promise<void>((r) => child.on('exit', () => r()));
  return { child, held, exited };
}

const busy = async (p: Promise<unknown>) => {
  const e = await p.then(() => null, (x: unknown) => x);
  expect(e).toBeInstanceOf(StoreError);
  expect((e as StoreError).code).toBe('database_busy');
  return (e as StoreError).message;
};

describe.each(['socket', 'file'] as const)('folder lock by %s', (mechanism) => {
  it('excludes a second holder and names the first; a release lets the next in; waiting works', async () => {
    const folder = fresh(`lock-${mechanism}`);
    const a = await lockFolder(folder, { mechanism });
    expect(a.kind).toBe(mechanism);
    if (mechanism === 'file') {
      // the holder file is the lock here: in one process the second attempt sees our own pid
      const msg = await busy(lockFolder(folder, { mechanism }));
      expect(msg).toContain(`process ${process.pid}`);
    } else {
      const msg = await busy(lockFolder(folder, { mechanism }));
      expect(msg).toContain(`process ${process.pid}`);
      expect(msg).toContain(folder);
    }
    setTimeout(() => void a.release(), 300);
    const b = await lockFolder(folder, { mechanism, waitMs: 20_000 });
    await b.release();
  });

  it('is free again at once when its holder is killed (SIGKILL)', async () => {
    const folder = fresh(`kill-${mechanism}`);
    const h = holder(folder, mechanism);
    await h.held;
    const msg = await busy(lockFolder(folder, { mechanism }));
    expect(msg).toContain(`process ${h.child.pid}`);
    h.child.kill('SIGKILL');
    await h.exited;
    // socket: released by the kernel; file: the holder file names a dead process and is taken over
    const lock = await lockFolder(folder, { mechanism });
    expect(JSON.parse(readFileSync(path.join(folder, HOLDER_FILE), 'utf8')).pid).toBe(process.pid);
    await lock.release();
  });
});

describe('embedded folder errors', () => {
  it('refuses a folder that holds other files but no database', async () => {
    const folder = fresh('not-a-db');
    writeFileSync(path.join(folder, 'notes.txt'), 'mine');
    const e = await openStore(folder).then(() => null, (x: unknown) => x);
    expect(e).toMatchObject({ name: 'StoreError', code: 'not_a_database' });
    expect(readdirSync(folder)).toEqual(['notes.txt']);
  });

  it('says plainly why a folder cannot be created', async () => {
    const file = path.join(root, 'a-file');
    writeFileSync(file, 'x');
    const e = await openStore(path.join(file, 'db')).then(() => null, (x: unknown) => x);
    expect(e).toMatchObject({ name: 'StoreError', code: 'database_unavailable' });
    expect((e as Error).message).toMatch(/cannot create the database folder .*ENOTDIR/);
    // a read-only command refuses a missing database (exit 2) and creates nothing
    const read = spawnSync(process.execPath, [bin, 'tests', '--db', path.join(file, 'db')], { encoding: 'utf8' });
    expect(read.status).toBe(2);
    expect(read.stderr).toMatch(/^fractile: there is no database at /);
    // ingest would create it, and says plainly why it cannot
    const manifest = path.join(root, 'cannot-create.csv');
    writeFileSync(manifest, 'test_id,grade,supplier,tested_on,yield[MPa],yield_definition,tensile[MPa]\nC1,G1,Mill,2024-01-02,355,rp0.2,490\n');
    const cli = spawnSync(process.execPath, [bin, 'ingest', manifest, '--db', path.join(file, 'db'), '--progress', 'none'], { encoding: 'utf8' });
    expect(cli.status).toBe(1);
    expect(cli.stderr.trim().split('\n')).toHaveLength(1); // one line, no stack trace
    expect(cli.stderr).toMatch(/^fractile: cannot create the database folder/);
  });

  it('reads a read-only folder through a copy and refuses to write it', async () => {
    const folder = path.join(fresh('ro'), 'db');
    const manifest = path.join(root, 'ro', 'm.csv');
    writeFileSync(manifest, 'test_id,grade,supplier,tested_on,yield[MPa],yield_definition,tensile[MPa]\nR1,G1,Mill,2024-01-02,355,rp0.2,490\n');
    const ingest = spawnSync(process.execPath, [bin, 'ingest', manifest, '--db', folder, '--progress', 'none'], { encoding: 'utf8' });
    expect(ingest.status, ingest.stderr).toBe(0);
    const chmodAll = (p: string, mode: number) => {
      chmodSync(p, mode | (statSync(p).isDirectory() ? 0o111 : 0));
      if (statSync(p).isDirectory()) for (const f of readdirSync(p)) chmodAll(path.join(p, f), mode);
    };
    chmodAll(folder, 0o444);
    chmodSync(root, 0o755); // others may reach the folder (mkdtemp makes 0700)
    // root may write anything: run as an unprivileged user then
    const asUser = (args: string[]) =>
      process.getuid?.() === 0 ? spawnSync('runuser', ['-u', 'nobody', '--', process.execPath, bin, ...args], { encoding: 'utf8' }) : spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });
    try {
      const tests = asUser(['tests', '--db', folder, '--format', 'json']);
      expect(tests.status, tests.stderr).toBe(0);
      expect((JSON.parse(tests.stdout).data as { test_id: string }[]).map((t) => t.test_id)).toEqual(['R1']);
      expect(tests.stderr).toMatch(/read-only: reading a temporary copy/);
      const write = asUser(['ingest', manifest, '--db', folder, '--progress', 'none']);
      expect(write.status).toBe(1);
      expect(write.stderr.trim()).toMatch(/^fractile: the database folder .* is read-only: this command writes/);
      expect(write.stderr.trim().split('\n')).toHaveLength(1);
    } finally {
      chmodAll(folder, 0o755);
    }
  });
});
