/**
 * Opens the store: an embedded PGlite database in a folder (created on first use; `memory://` for
 * an in-memory one), or a PostgreSQL server (`postgres://…` / `postgresql://…`) through a `pg`
 * pool. Both speak the same SQL; bulk rows go in by COPY (pg-copy-streams on a server, PGlite's
 * COPY from `/dev/blob` embedded, sent in chunks of about 2 MB so memory stays bounded). On
 * PGlite 0.4.6, COPY from a blob was measured against multi-row parameterised INSERT in chunks of
 * 50 rows: 500 rows of two 2,000-element float8[] arrays took 4.2 s by COPY and 4.9 s by INSERT
 * (in memory, one core), so COPY it is on both engines.
 *
 * `copyRows` called inside `store.transaction(fn)` writes on that transaction's connection (the
 * transaction is tracked with AsyncLocalStorage); outside, it runs in its own implicit
 * transaction on a connection of its own.
 *
 * Type parsing is made the same on both engines: int8 → number (ids stay far below 2^53),
 * date → 'YYYY-MM-DD' string.
 *
 * An embedded folder is held by one process while open (embedded-folder.ts, folder-lock.ts); its
 * commits are flushed to the disk (pglite-durability.ts). `exclusive(name, fn)` gives stages one
 * writer per name across processes (exclusive.ts).
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { Kysely, PostgresDialect, sql } from 'kysely';
import type { PostgresPool, PostgresPoolClient } from 'kysely';
import { PGliteDialect } from 'kysely-pglite-dialect';
import pg from 'pg';
import { from as copyFrom, to as copyTo } from 'pg-copy-streams';
import { BinaryCopyEncoder, decodeBinaryCopy, type BinaryType, type BinaryValue, type DecodedValue } from './copy-binary.ts';
import { copyLine } from './copy-text.ts';
import { prepareFolder } from './embedded-folder.ts';
import { clearFolder, COPY_MARKER, copyTemplate, ensureTemplate, type TemplateSpec } from './embedded-template.ts';
import { HOLDER_FILE } from './folder-lock.ts';
import { MIGRATIONS } from './migrations/index.ts';
import { inProcessExclusive, inProcessShared, serverExclusive, type Exclusive, type SharedSections } from './exclusive.ts';
import { migrateToLatest } from './migrate.ts';
import { installFsync, PGLITE_DURABLE_PARAMS } from './pglite-durability.ts';
import type { Database } from './schema.ts';
import { StoreError } from './store-error.ts';

export type Engine = 'pglite' | 'postgres';

export interface Store {
  db: Kysely<Database>;
  engine: Engine;
  target: string;
  /** Bulk-writes rows (values in column order) by COPY; returns the number of rows written. */
  copyRows(table: string, columns: string[], rows: Iterable<unknown[]> | AsyncIterable<unknown[]>): Promise<number>;
  /** The same in COPY's binary format, each column of the type given (copy-binary.ts); returns the number of rows written. */
  copyBinaryRows(table: string, columns: readonly string[], types: readonly BinaryType[], rows: Iterable<readonly BinaryValue[]> | AsyncIterable<readonly BinaryValue[]>): Promise<number>;
  /**
   * Rows of a query read by `COPY (query) TO … (FORMAT binary)`, each column decoded as the type
   * given (bytea as bytes). The query takes no parameters: build it from trusted literals only.
   */
  copyOutBinary(query: string, types: readonly BinaryType[]): Promise<DecodedValue[][]>;
  /** Runs `fn` in one transaction (committed when it resolves, rolled back when it throws). */
  transaction<T>(fn: (trx: Kysely<Database>) => Promise<T>): Promise<T>;
  /** Runs `fn` while no other process (or call) holds `name` on this database, waiting for it (exclusive.ts). */
  exclusive: Exclusive;
  /** Runs work side by side under a name, and other work only when none of it runs (exclusive.ts). */
  sections: SharedSections;
  /** embedded only: true when a read-only folder is read through a temporary copy */
  readOnlyCopy: boolean;
  close(): Promise<void>;
}

export interface OpenStoreOptions {
  /** apply pending migrations (default true) */
  migrate?: boolean;
  /** embedded: how long to wait for another process holding the folder (ms, default 0: fail at once) */
  waitMs?: number;
  /** embedded: the caller only reads; a read-only folder is then read through a temporary copy */
  readOnly?: boolean;
  /** embedded: a new database is copied from the cached template (default true; embedded-template.ts) */
  template?: boolean;
}

export function isServerTarget(target: string): boolean {
  return /^postgres(ql)?:\/\//i.test(target);
}

const IDENT = /^[a-z_][a-z0-9_]*$/;
function copySql(table: string, columns: readonly string[], source: string, binary = false): string {
  for (const n of [table, ...columns]) if (!IDENT.test(n)) throw new Error(`copyRows: not a plain identifier: ${n}`);
  return `copy ${table} (${columns.join(', ')}) from ${source}${binary ? ' with (format binary)' : ''}`;
}

const copyOutSql = (query: string, target: string) => `copy (${query}) to ${target} with (format binary)`;

const PGLITE_CHUNK_BYTES = 2 * 1024 * 1024;

/**
 * The embedded engine runs with small shared buffers (16 MB, WAL buffers 1 MB, instead of
 * PostgreSQL's 128 MB and 4 MB): they live in the engine's WebAssembly memory, which never
 * shrinks. Measured on PGlite 0.4.6: RSS once an existing folder is open 363 → 228 MB, and after
 * COPY of 4,000 rows of a 2,000-element float8[] array, peak 420 → 332 MB; ingest of 2,000
 * tests × 2,000 points, peak 574 → 342–435 MB (with COPY chunks of 2 MB instead of 8 MB), and
 * 21.7 → 17.9 s; 10,000 tests: 579 → 408–434 MB, of which about 250–295 MB is there once the
 * folder is open (Node, the compiled engine and its memory). 8 MB of shared buffers was slower
 * (21.3 s on 2,000 tests) and not smaller.
 */
const PGLITE_START_PARAMS = [...PGLITE_DURABLE_PARAMS, '-c', 'shared_buffers=16MB', '-c', 'wal_buffers=1MB'];

async function* eachRow<R>(rows: Iterable<R> | AsyncIterable<R>): AsyncGenerator<R> {
  yield* rows as AsyncIterable<R>;
}

/** The engine package's version (its package.json beside the entry it resolves to), or null when not found. */
function pgliteVersion(): string | null {
  try {
    let dir = path.dirname(createRequire(import.meta.url).resolve('@electric-sql/pglite'));
    for (let i = 0; i < 4; i++, dir = path.dirname(dir)) {
      const file = path.join(dir, 'package.json');
      if (!existsSync(file)) continue;
      const pkg = JSON.parse(readFileSync(file, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === '@electric-sql/pglite' && pkg.version) return pkg.version;
    }
  } catch {}
  return null;
}

/** What a template of a new embedded database depends on, and how to make one (embedded-template.ts). */
function templateSpec(): TemplateSpec | null {
  const version = pgliteVersion();
  if (!version) return null; // an engine of unknown version: no template, whose files it might not read
  const migrations = Object.entries(MIGRATIONS).map(([name, m]) => `${name}:${String(m.up)}`);
  return {
    parts: [`pglite ${version}`, ...PGLITE_START_PARAMS, ...migrations],
    async create(dir) {
      await (await openPglite(dir, { template: false })).close();
    },
  };
}

function openPglite(target: string, opts: OpenStoreOptions): Promise<Store> {
  return (async () => {
    const folder = target.startsWith('memory://') ? null : await prepareFolder(target, { readOnly: opts.readOnly, waitMs: opts.waitMs });
    let pglite: PGlite;
    try {
      const halfCopied = folder !== null && existsSync(path.join(folder.path, COPY_MARKER));
      if (folder && !folder.copy && (halfCopied || (opts.template !== false && !existsSync(path.join(folder.path, 'PG_VERSION'))))) {
        const spec = templateSpec();
        const template = spec ? await ensureTemplate(spec) : null;
        if (template) copyTemplate(template, folder.path, [HOLDER_FILE]);
        else if (halfCopied) clearFolder(folder.path, [HOLDER_FILE]);
      }
      pglite = await PGlite.create(folder?.path ?? target, {
        parsers: { 20: (v: string) => Number(v), 1082: (v: string) => v },
        startParams: PGLITE_START_PARAMS,
      });
      installFsync(pglite);
    } catch (e) {
      await folder?.dispose();
      throw new StoreError('database_unavailable', `cannot open the embedded database in ${target}: ${(e as Error).message}`, { cause: e });
    }
    const db = new Kysely<Database>({ dialect: new PGliteDialect(pglite) });
    const inTrx = new AsyncLocalStorage<true>();

    async function copyChunks(table: string, columns: string[], rows: Iterable<unknown[]> | AsyncIterable<unknown[]>): Promise<number> {
      const statement = copySql(table, columns, `'/dev/blob'`);
      let parts: string[] = [];
      let bytes = 0;
      let count = 0;
      const flush = async () => {
        if (parts.length === 0) return;
        await pglite.query(statement, [], { blob: new Blob(parts) });
        parts = [];
        bytes = 0;
      };
      for await (const row of eachRow(rows)) {
        const line = copyLine(row);
        parts.push(line);
        bytes += line.length;
        count++;
        if (bytes >= PGLITE_CHUNK_BYTES) await flush();
      }
      await flush();
      return count;
    }

    /** Binary COPY in chunks of about 2 MB, each a whole binary COPY input of its own. */
    async function copyBinaryChunks(table: string, columns: readonly string[], types: readonly BinaryType[], rows: Iterable<readonly BinaryValue[]> | AsyncIterable<readonly BinaryValue[]>): Promise<number> {
      const statement = copySql(table, columns, `'/dev/blob'`, true);
      const enc = new BinaryCopyEncoder(types, true, PGLITE_CHUNK_BYTES);
      let count = 0;
      const flush = async () => {
        const parts = enc.take();
        if (parts.length) await pglite.query(statement, [], { blob: new Blob(parts as BlobPart[]) });
      };
      for await (const row of eachRow(rows)) {
        enc.row(row);
        count++;
        if (enc.ready()) await flush();
      }
      await flush();
      return count;
    }

    /** In a transaction of its own unless one is going on (the dialect's single connection is held, so nothing interleaves). */
    const inTransaction = <T>(fn: () => Promise<T>): Promise<T> => (inTrx.getStore() ? fn() : db.transaction().execute(fn));

    const store: Store = {
      db,
      engine: 'pglite',
      target,
      copyRows: (table, columns, rows) => inTransaction(() => copyChunks(table, columns, rows)),
      copyBinaryRows: (table, columns, types, rows) => inTransaction(() => copyBinaryChunks(table, columns, types, rows)),
      async copyOutBinary(query, types) {
        const r = await pglite.query(copyOutSql(query, `'/dev/blob'`));
        if (!r.blob) throw new Error('copyOutBinary: the engine returned no data');
        return decodeBinaryCopy(new Uint8Array(await r.blob.arrayBuffer()), types);
      },
      transaction(fn) {
        return db.transaction().execute((trx) => inTrx.run(true, () => fn(trx)));
      },
      exclusive: inProcessExclusive(),
      sections: inProcessShared(),
      readOnlyCopy: folder?.copy ?? false,
      async close() {
        try {
          await db.destroy();
        } finally {
          await folder?.dispose();
        }
      },
    };
    return migrated(store, opts);
  })();
}

const pgTypes = {
  getTypeParser(oid: number, format?: 'text' | 'binary') {
    if (oid === 20) return (v: string) => Number(v);
    if (oid === 1082) return (v: string) => v;
    return pg.types.getTypeParser(oid, format);
  },
};

/** A pool of exactly one checked-out client, so a Kysely instance runs on one connection. */
function singleClientPool(client: pg.PoolClient): PostgresPool {
  const wrapped: PostgresPoolClient = {
    query: client.query.bind(client) as PostgresPoolClient['query'],
    release() {},
  };
  return { connect: async () => wrapped, end: async () => {} };
}

/**
 * COPY … FROM STDIN on a client: `write(row)` returns the bytes to send for a row (or null to
 * hold them), `end()` the last ones; the stream's back-pressure is honoured.
 */
async function copyOnClient<R>(client: pg.PoolClient, statement: string, rows: Iterable<R> | AsyncIterable<R>, write: (row: R) => Buffer | string | null, end: () => Buffer | string | null): Promise<number> {
  const stream = client.query(copyFrom(statement));
  let count = 0;
  let failed: Error | null = null;
  const done = new Promise<void>((resolve, reject) => {
    stream.on('finish', () => resolve());
    stream.on('error', (e: Error) => {
      failed = e;
      reject(e);
    });
  });
  done.catch(() => {});
  try {
    for await (const row of eachRow(rows)) {
      if (failed) break;
      const out = write(row);
      count++;
      if (out !== null && !stream.write(out)) await new Promise<void>((r) => { const on = () => { stream.off('error', on); r(); }; stream.once('drain', on); stream.once('error', on); });
    }
    if (!failed) {
      const last = end();
      if (last?.length) stream.write(last);
      stream.end();
    }
  } catch (e) {
    // the rows' source failed: abort the COPY so the server discards what it received
    stream.destroy(e as Error);
    await done.catch(() => {});
    throw e;
  }
  await done;
  return count;
}

/** Text COPY rows, sent in pieces of about 256 kB. */
function copyTextOnClient(client: pg.PoolClient, table: string, columns: string[], rows: Iterable<unknown[]> | AsyncIterable<unknown[]>): Promise<number> {
  let buf = '';
  const take = () => { const out = buf; buf = ''; return out; };
  return copyOnClient(client, copySql(table, columns, 'stdin'), rows, (row) => ((buf += copyLine(row)).length >= 256 * 1024 ? take() : null), take);
}

/** Binary COPY rows, one stream (header, tuples, trailer) sent in pieces of about 256 kB. */
function copyBinaryOnClient(client: pg.PoolClient, table: string, columns: readonly string[], types: readonly BinaryType[], rows: Iterable<readonly BinaryValue[]> | AsyncIterable<readonly BinaryValue[]>): Promise<number> {
  const enc = new BinaryCopyEncoder(types, false, 256 * 1024);
  return copyOnClient(client, copySql(table, columns, 'stdin', true), rows, (row) => (enc.row(row), enc.ready() ? Buffer.concat(enc.take()) : null), () => Buffer.concat(enc.finish()));
}

/** `COPY (query) TO STDOUT (FORMAT binary)` on a client, decoded. */
async function copyOutOnClient(client: pg.PoolClient, query: string, types: readonly BinaryType[]): Promise<DecodedValue[][]> {
  const stream = client.query(copyTo(copyOutSql(query, 'stdout')));
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(c as Buffer);
  return decodeBinaryCopy(Buffer.concat(chunks), types);
}

async function openServer(target: string, opts: OpenStoreOptions): Promise<Store> {
  const pool = new pg.Pool({ connectionString: target, types: pgTypes, max: 4 });
  // A pooled connection that the server ends (restart, dropped database) must not bring down the
  // process: idle, the pool discards it; checked out, the pool no longer listens to it, so each
  // client gets a listener of its own for its life (the caller's query fails with the error, and
  // the pool drops the client when it comes back unusable).
  pool.on('error', () => {});
  pool.on('connect', (client) => client.on('error', () => {}));
  const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
  const current = new AsyncLocalStorage<pg.PoolClient>();
  const locks = serverExclusive(target);
  /** Runs on the transaction's client when inside `transaction`, else on a pooled one. */
  async function onClient<T>(fn: (client: pg.PoolClient) => Promise<T>): Promise<T> {
    const client = current.getStore();
    if (client) return fn(client);
    const own = await pool.connect();
    try {
      return await fn(own);
    } finally {
      own.release();
    }
  }

  const store: Store = {
    db,
    engine: 'postgres',
    target,
    copyRows: (table, columns, rows) => onClient((c) => copyTextOnClient(c, table, columns, rows)),
    copyBinaryRows: (table, columns, types, rows) => onClient((c) => copyBinaryOnClient(c, table, columns, types, rows)),
    copyOutBinary: (query, types) => onClient((c) => copyOutOnClient(c, query, types)),
    async transaction(fn) {
      const client = await pool.connect();
      const trx = new Kysely<Database>({ dialect: new PostgresDialect({ pool: singleClientPool(client) }) });
      let broken = false;
      try {
        await client.query('begin');
        const result = await current.run(client, () => fn(trx));
        await client.query('commit');
        return result;
      } catch (e) {
        await client.query('rollback').catch(() => {
          broken = true;
        });
        throw e;
      } finally {
        client.release(broken);
      }
    },
    exclusive: locks.exclusive,
    sections: locks.sections,
    readOnlyCopy: false,
    async close() {
      await locks.close();
      await db.destroy();
    },
  };
  return migrated(store, opts);
}

/** Applies pending migrations unless told not to; a failed migration closes the store. */
async function migrated(store: Store, opts: OpenStoreOptions): Promise<Store> {
  if (opts.migrate === false) return store;
  try {
    await migrateToLatest(store.db);
  } catch (e) {
    await store.close();
    throw e;
  }
  return store;
}

/** Opens (and by default migrates) the store at `target`. */
export async function openStore(target: string, opts: OpenStoreOptions = {}): Promise<Store> {
  if (isServerTarget(target)) return openServer(target, opts);
  return openPglite(target, opts);
}

/** True when the database answers (used by health checks). */
export async function ping(store: Store): Promise<boolean> {
  const r = await sql<{ one: number }>`select 1 as one`.execute(store.db);
  return r.rows[0]?.one === 1;
}
