/**
 * The CSV cell writer against csv-stringify (the reference library), whose `escape_formulas`
 * option is the same rule (OWASP "CSV Injection": an apostrophe before a text cell that begins
 * with = + - @, tab or CR, and the full-width forms; numbers unchanged) with RFC 4180 quoting;
 * ours also treats spaces before a formula character, and a leading line feed, as a formula start. Comment JSON reads back equal.
 */
import fc from 'fast-check';
import { stringify } from 'csv-stringify/sync';
import { describe, expect, it } from 'vitest';
import { commentJson, csvCell, csvText } from './csv-cell.ts';

const ALPHABET = ['=', '+', '-', '@', '\t', '\r', '\n', ' ', ',', '"', "'", 'a', '1', '.', '＝', '＋', '－', '＠', 'é'];
const text = fc.array(fc.constantFrom(...ALPHABET), { maxLength: 8 }).map((cs) => cs.join(''));
const reference = (v: unknown) => stringify([[v]], { escape_formulas: true, eof: false });

describe('csv cells', () => {
  it('write text as csv-stringify with escape_formulas does, and spaces before a formula start count as it', () => {
    fc.assert(
      fc.property(text, (s) => {
        // ours also prefixes spaces before a formula start, and a leading line feed
        if (/^( +[=+\-@＝＋－＠]|\n)/.test(s)) expect(csvText(s)).toBe(reference(`'${s}`));
        else if (s !== '') expect(csvText(s)).toBe(reference(s));
      }),
      { numRuns: 3000, seed: 42 },
    );
  });

  it('leave numbers as numbers, negative ones included', () => {
    for (const v of [-1.5, 0, 355.25, -0.001, 1e-7]) expect(csvCell(v)).toBe(reference(v));
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell(true)).toBe('true');
  });

  it('write comment JSON that reads back unchanged and splits into no formula start', () => {
    fc.assert(
      fc.property(fc.dictionary(text, fc.oneof(text, fc.double({ noNaN: true, noDefaultInfinity: true }), fc.array(text, { maxLength: 3 }))), (v) => {
        const j = commentJson(v);
        expect(JSON.parse(j)).toEqual(JSON.parse(JSON.stringify(v)));
        for (const piece of j.split(',').slice(1)) {
          const p = piece.trimStart().replace(/^"/, '').trimStart();
          expect(/^[=+@＝＋－＠]/.test(p) || (/^-/.test(p) && !/^-\d/.test(p))).toBe(false);
        }
      }),
      { numRuns: 1000, seed: 7 },
    );
  });
});
