/**
 * New embedded databases copied from a cached template (embedded-template.ts): the first new
 * database makes the template, later ones are copies of it (a marker file put into the template
 * shows up in them), each copy is a database of its own with the full schema, durable settings
 * and no data of another; a folder left half-copied by a killed process is copied again; with
 * templates off nothing is cached. The schema check compares with a database made without the
 * template: the same tables, columns and migrations (PostgreSQL's catalog, information_schema).
 */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { afterAll, describe, expect, it } from 'vitest';
import { openStore, type Store } from '@fractile/store';
import { COPY_MARKER, ensureTemplate } from '../packages/store/src/embedded-template.ts';

const root = mkdtempSync(path.join(tmpdir(), 'fractile-template-'));
const cache = path.join(root, 'cache');
process.env.FRACTILE_TEMPLATE_DIR = cache;
afterAll(() => rmSync(root, { recursive: true, force: true }));

const templates = () => (existsSync(cache) ? readdirSync(cache).filter((f) => f.startsWith('template-')) : []);

async function schema(store: Store): Promise<string[]> {
  const cols = await sql<{ c: string }>`select table_name || '.' || column_name || ':' || data_type as c from information_schema.columns where table_schema = 'public' order by 1`.execute(store.db);
  const migs = await sql<{ name: string }>`select name from kysely_migration order by name`.execute(store.db);
  return [...cols.rows.map((r) => r.c), ...migs.rows.map((r) => `migration ${r.name}`)];
}

describe('new embedded databases from the template', () => {
  it('makes the template once, copies it after, each copy a database of its own with the whole schema', async () => {
    const a = await openStore(path.join(root, 'a'));
    expect(templates()).toHaveLength(1);
    const t = path.join(cache, templates()[0]);
    writeFileSync(path.join(t, 'from-the-template.txt'), 'x');
    await sql`insert into grades (code) values ('TPL-1')`.execute(a.db);
    const b = await openStore(path.join(root, 'b'));
    expect(existsSync(path.join(root, 'b', 'from-the-template.txt'))).toBe(true);
    expect((await sql<{ n: number }>`select count(*)::int as n from grades`.execute(b.db)).rows[0].n).toBe(0);
    expect((await sql<{ fsync: string }>`show fsync`.execute(b.db)).rows[0].fsync).toBe('on');
    const plain = await openStore(path.join(root, 'plain'), { template: false });
    expect(existsSync(path.join(root, 'plain', 'from-the-template.txt'))).toBe(false);
    const want = await schema(plain);
    expect(want.length).toBeGreaterThan(50);
    expect(await schema(b)).toEqual(want);
    expect(await schema(a)).toEqual(want);
    for (const s of [a, b, plain]) await s.close();
    // reopened: the copy is a lasting database
    const again = await openStore(path.join(root, 'b'));
    await sql`insert into grades (code) values ('TPL-2')`.execute(again.db);
    await again.close();
    const third = await openStore(path.join(root, 'b'));
    expect((await sql<{ code: string }>`select code from grades`.execute(third.db)).rows).toEqual([{ code: 'TPL-2' }]);
    await third.close();
  });

  it('copies again into a folder a killed process left half-copied', async () => {
    const folder = path.join(root, 'half');
    mkdirSync(path.join(folder, 'base'), { recursive: true });
    writeFileSync(path.join(folder, COPY_MARKER), '1234\n');
    writeFileSync(path.join(folder, 'base', 'junk'), 'partial');
    const s = await openStore(folder);
    expect(existsSync(path.join(folder, COPY_MARKER))).toBe(false);
    expect(existsSync(path.join(folder, 'base', 'junk'))).toBe(false);
    expect(existsSync(path.join(folder, 'PG_VERSION'))).toBe(true);
    expect((await sql<{ n: number }>`select count(*)::int as n from tests`.execute(s.db)).rows[0].n).toBe(0);
    await s.close();
  });

  it('makes one template per key even when asked at once, and none when turned off', async () => {
    const dir = path.join(root, 'keyed');
    process.env.FRACTILE_TEMPLATE_DIR = dir;
    let made = 0;
    const spec = {
      parts: ['k1'],
      async create(folder: string) {
        made++;
        mkdirSync(folder);
        writeFileSync(path.join(folder, 'PG_VERSION'), '17\n');
      },
    };
    const [x, y] = await Promise.all([ensureTemplate(spec), ensureTemplate(spec)]);
    expect(x).toBe(y);
    expect(readdirSync(dir).filter((f) => f.startsWith('template-'))).toHaveLength(1);
    expect(readdirSync(dir).filter((f) => f.startsWith('.making-'))).toEqual([]);
    expect(made).toBeLessThanOrEqual(2);
    expect(await ensureTemplate(spec)).toBe(x);
    expect(await ensureTemplate({ ...spec, parts: ['k2'] })).not.toBe(x);
    process.env.FRACTILE_TEMPLATE = 'off';
    expect(await ensureTemplate({ ...spec, parts: ['k3'] })).toBeNull();
    delete process.env.FRACTILE_TEMPLATE;
    process.env.FRACTILE_TEMPLATE_DIR = cache;
  });
});
