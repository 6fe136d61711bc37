/**
 * What a failure prints and the exit status it gives (README "Exit status"): a location only for
 * the user's input; the database engine's errors — which carry the engine's own source file and
 * line, e.g. nbtinsert.c:664 — as a plain message with exit 1; a busy embedded folder exit 4.
 */
import pg from 'pg';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { RejectionError, reject } from '@fractile/ingest';
import { CatalogError } from '@fractile/pipeline';
import { StoreError } from '@fractile/store';
import { CliError, EXIT_BUSY, reportFailure } from './context.ts';

function printed(err: unknown, debug = false): { code: number; text: string } {
  let text = '';
  const spy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((text += String(s)), true));
  const code = reportFailure(err, debug);
  spy.mockRestore();
  return { code, text };
}

describe('reportFailure', () => {
  afterEach(() => vi.restoreAllMocks());

  it('names the file, line and column of bad input, exit 2', () => {
    expect(printed(new RejectionError(reject('m.csv', 4, 6, 'not_a_number', 'diameter: not a number: "ten"')))).toEqual({ code: 2, text: 'fractile: m.csv:4:6: not_a_number: diameter: not a number: "ten"\n' });
    expect(printed(new CatalogError('invalid JSON', 'grades.json', 3, 9))).toEqual({ code: 2, text: 'fractile: grades.json:3:9: bad_catalog: invalid JSON\n' });
    expect(printed(new CliError('--batch-size must be a whole number'))).toEqual({ code: 2, text: 'fractile: --batch-size must be a whole number\n' });
  });

  it('prints a database error plainly with exit 1, never its source location as input', () => {
    const e = new pg.DatabaseError('duplicate key value violates unique constraint "test_results_pkey"', 0, 'error');
    Object.assign(e, { severity: 'ERROR', code: '23505', file: 'nbtinsert.c', line: '664', routine: '_bt_check_unique' });
    const out = printed(e);
    expect(out.code).toBe(1);
    expect(out.text).toBe('fractile: the database reported an error: duplicate key value violates unique constraint "test_results_pkey" (SQLSTATE 23505)\n');
    expect(out.text).not.toContain('nbtinsert.c');
  });

  it('prints store and system errors in one line; a busy folder exits 4', () => {
    expect(printed(new StoreError('database_busy', 'the database folder db is in use by process 7'))).toEqual({ code: EXIT_BUSY, text: 'fractile: the database folder db is in use by process 7\n' });
    expect(printed(new StoreError('database_unavailable', 'cannot create the database folder /x: permission denied (EACCES)'))).toEqual({ code: 1, text: 'fractile: cannot create the database folder /x: permission denied (EACCES)\n' });
    const sys = Object.assign(new Error("EACCES: permission denied, open 'out/report.html'"), { code: 'EACCES', syscall: 'open', errno: -13 });
    expect(printed(sys)).toEqual({ code: 1, text: "fractile: EACCES: permission denied, open 'out/report.html'\n" });
  });

  it('says a connection lost under a command is lost (node-postgres messages), exit 1, not a defect', () => {
    for (const m of ['Connection terminated unexpectedly', 'Client has encountered a connection error and is not queryable']) {
      const out = printed(new Error(m));
      expect(out.code).toBe(1);
      expect(out.text).toBe(`fractile: the connection to the database server was lost (${m}); the server rolls back what was not committed: run the command again\n`);
    }
  });

  it('prints a thrown object that is not an Error as its JSON, not [object Object]', () => {
    expect(printed({ reason: 'closed' }).text).toMatch(/^fractile: internal error: \{"reason":"closed"\}\n/);
  });

  it('prints an unexpected error (a defect) without its stack unless --debug', () => {
    const out = printed(new TypeError('x is undefined'));
    expect(out.code).toBe(1);
    expect(out.text).toMatch(/^fractile: internal error: x is undefined\n.*--debug/);
    expect(out.text).not.toMatch(/\s+at /);
    const debug = printed(new TypeError('x is undefined'), true);
    expect(debug.text).toMatch(/^fractile: TypeError: x is undefined\n\s+at /);
  });

  it('says plainly that a server cannot be reached or has no such database, exit 2', () => {
    const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:1'), { code: 'ECONNREFUSED', syscall: 'connect' });
    // kysely's migrator wraps the driver's error as its cause
    const out = printed(new Error('migration (unknown) failed', { cause: refused }));
    expect(out.code).toBe(2);
    expect(out.text).toMatch(/^fractile: cannot use the database server: connection refused.*ECONNREFUSED.*--db/);
    const none = Object.assign(new pg.DatabaseError('database "nosuch" does not exist', 0, 'error'), { severity: 'FATAL', code: '3D000' });
    expect(printed(none)).toMatchObject({ code: 2, text: expect.stringMatching(/no database of that name: create it/) });
  });
});
