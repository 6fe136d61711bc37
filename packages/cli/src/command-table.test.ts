/** The static command table lists every command file, each once, with distinct names and orders. */
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import * as table from './command-table.ts';

describe('command table', () => {
  it('has one entry for every file in commands/', () => {
    const files = readdirSync(new URL('./commands', import.meta.url)).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts')).map((f) => f.replace(/\.ts$/, '')).sort();
    expect(Object.keys(table).sort()).toEqual(files);
    const orders = Object.values(table).map((c) => c.order);
    expect(new Set(orders).size).toBe(orders.length);
  });
});
