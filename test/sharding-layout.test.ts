/**
 * The schema stays fit for a PostgreSQL sharded by test row id (issue 14; docs/scale-out.md):
 * every table of the migrated schema is either distributed (on the column named below, all
 * co-located with `tests.id`) or a reference/coordinator table; read from the catalog
 * (pg_constraint, pg_index — PostgreSQL documentation, "System Catalogs"):
 *   - every unique index and primary key of a distributed table contains its distribution column,
 *     except the listed identity indexes (a distributed cluster cannot enforce those across
 *     shards; the ingest writer checks them in SQL inside the database's ingest section, one
 *     writer at a time — common practice for sharded PostgreSQL: unique constraints must include
 *     the distribution column);
 *   - a foreign key between distributed tables joins distribution column to distribution column;
 *   - no reference table has a foreign key into a distributed table;
 *   - docs/scale-out.md names every table, so a new table is placed on paper before it lands.
 * A new table, index or key that breaks a rule fails here until it is placed and justified.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { openStore, type Store } from '@fractile/store';

/** distributed table → its distribution column (all co-located with tests.id) */
const DISTRIBUTED: Record<string, string> = { tests: 'id', curves: 'test_row_id', summary_records: 'test_row_id', test_results: 'test_pk' };
/** small tables replicated to every node, or kept on the coordinator */
const REFERENCE = [
  'source_files', 'ingest_runs', 'grades', 'suppliers', 'heats', 'rejections', 'exclusions', 'alert_actions',
  'stage_settings', 'stage_runs', 'group_results', 'drift_alerts', 'queue_requests', 'queue_parts', 'kysely_migration', 'kysely_migration_lock',
];
/** the unique indexes a sharded cluster cannot enforce across shards (see the header) */
const CROSS_SHARD_UNIQUE = ['tests_current_identity', 'tests_lab_test_id_version_key'];

let store: Store;
beforeAll(async () => {
  store = await openStore('memory://');
});
afterAll(async () => store?.close());

describe('sharding layout (distribution by test row id)', () => {
  it('places every table, and docs/scale-out.md names each', async () => {
    const r = await sql<{ t: string }>`select tablename as t from pg_tables where schemaname = 'public' order by 1`.execute(store.db);
    const tables = r.rows.map((x) => x.t);
    expect(tables.filter((t) => !(t in DISTRIBUTED) && !REFERENCE.includes(t))).toEqual([]);
    const doc = readFileSync(new URL('../docs/scale-out.md', import.meta.url), 'utf8');
    expect(tables.filter((t) => !t.startsWith('kysely_') && !doc.includes(`\`${t}\``))).toEqual([]);
  });

  it('unique indexes of distributed tables contain the distribution column, but the listed ones', async () => {
    const r = await sql<{ table: string; index: string; columns: string[] }>`
      select c.relname as table, i.relname as index,
             array(select a.attname from unnest(x.indkey) k join pg_attribute a on a.attrelid = c.oid and a.attnum = k)::text[] as columns
      from pg_index x join pg_class i on i.oid = x.indexrelid join pg_class c on c.oid = x.indrelid
      join pg_namespace n on n.oid = c.relnamespace
      where n.nspname = 'public' and x.indisunique`.execute(store.db);
    const offending = r.rows.filter((x) => x.table in DISTRIBUTED && !x.columns.includes(DISTRIBUTED[x.table])).map((x) => x.index).sort();
    expect(offending).toEqual([...CROSS_SHARD_UNIQUE].sort());
  });

  it('foreign keys: distributed to distributed on the distribution columns, none from a reference table into a distributed one', async () => {
    const r = await sql<{ from: string; to: string; from_cols: string[]; to_cols: string[] }>`
      select c.relname as from, t.relname as to,
             array(select a.attname from unnest(k.conkey) q join pg_attribute a on a.attrelid = k.conrelid and a.attnum = q)::text[] as from_cols,
             array(select a.attname from unnest(k.confkey) q join pg_attribute a on a.attrelid = k.confrelid and a.attnum = q)::text[] as to_cols
      from pg_constraint k join pg_class c on c.oid = k.conrelid join pg_class t on t.oid = k.confrelid
      where k.contype = 'f' and k.connamespace = 'public'::regnamespace`.execute(store.db);
    expect(r.rows.length).toBeGreaterThan(0);
    const bad = r.rows.filter((f) => {
      const fromDist = f.from in DISTRIBUTED;
      const toDist = f.to in DISTRIBUTED;
      if (!toDist) return false; // into a reference table: allowed from anywhere
      if (!fromDist) return true; // reference → distributed: would need every shard
      return !(f.from_cols.length === 1 && f.from_cols[0] === DISTRIBUTED[f.from] && f.to_cols[0] === DISTRIBUTED[f.to]);
    });
    expect(bad.map((f) => `${f.from}(${f.from_cols}) → ${f.to}(${f.to_cols})`)).toEqual([]);
  });
});
