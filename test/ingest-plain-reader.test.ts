/**
 * The fast reader for plain curve files must give exactly what the general (csv-parse) reader
 * gives: the same stored doubles (Object.is, so -0 counts), the same hash, and for a bad file the same rejection (code, line, column, message). Values are checked
 * against Number() of the cell text, which ECMAScript requires to be the correctly rounded double
 * (ECMA-262, StringToNumber / RoundMVResult), times the NIST SP 811 factor (kN → N: 1000).
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readCurveFile } from '../packages/ingest/src/curve-reader.ts';
import { readPlainCurve } from '../packages/ingest/src/plain-curve.ts';

const dir = mkdtempSync(path.join(tmpdir(), 'fractile-plain-'));
let k = 0;
function write(content: string | Uint8Array): string {
  const f = path.join(dir, `c${k++}.csv`);
  writeFileSync(f, content);
  return f;
}

async function both(file: string) {
  const fast = await readCurveFile(file, 'c.csv', null);
  const general = await readCurveFile(file, 'c.csv', null, { general: true });
  return { fast, general };
}

function expectSame(a: Awaited<ReturnType<typeof readCurveFile>>, b: Awaited<ReturnType<typeof readCurveFile>>): void {
  expect(a.ok).toBe(b.ok);
  if (!a.ok || !b.ok) {
    expect(a).toEqual(b);
    return;
  }
  expect(a.sha256).toBe(b.sha256);
  expect(a.sizeBytes).toBe(b.sizeBytes);
  const ca = a.channels;
  const cb = b.channels;
  expect(ca.nPoints).toBe(cb.nPoints);
  for (const key of ['time', 'force', 'extension', 'crosshead', 'stress', 'strain'] as const) {
    const x = ca[key];
    const y = cb[key];
    expect(x === null).toBe(y === null);
    if (!x || !y) continue;
    expect(x.length).toBe(y.length);
    for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) expect([key, i, x[i]]).toEqual([key, i, y[i]]);
  }
}

/** numbers written the many ways our format allows */
const goodNumber = fc.oneof(
  fc.double({ noNaN: true, noDefaultInfinity: true }).map((v) => String(v)),
  fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((v) => v.toFixed(5)),
  fc.integer({ min: -99999, max: 99999 }).map(String),
  fc.constantFrom('0', '-0', '-0.0', '+1.5', '.25', '3.', '007.5', '1E+5', '1e-400', '4.9e-324', '2.2250738585072014e-308', '0.1000000000000000055511151231257827', '123456789.123456789', '9007199254740993', '1.7976931348623157e308', ' 2.5', '2.5\t', '12345678901234567890e-10'),
);
const badNumber = fc.constantFrom('', ' ', 'abc', 'nan', 'NaN', '-inf', 'Infinity', '1e400', '1.2.3', '1e', '+', '.', '1,5', '0x10', '1_000', '١٢', '"1.5"', '5e+');

describe('plain curve reader', () => {
  it('reads plain files itself (a data set of the benchmark form is not handed to the general reader)', () => {
    const text = '# c\ntime[s],force[kN],extension[mm]\n' + Array.from({ length: 30 }, (_, i) => `${i * 0.05},${(i * 1.25).toFixed(4)},${(i / 7).toFixed(5)}`).join('\n') + '\n';
    const r = readPlainCurve(new TextEncoder().encode(text), 20);
    expect(r).not.toBeNull();
    expect(r!.nPoints).toBe(30);
    expect(Object.is(r!.values.force![3], Number((3 * 1.25).toFixed(4)) * 1000)).toBe(true);
    expect(Object.is(r!.values.extension![7], Number((7 / 7).toFixed(5)))).toBe(true);
  });

  it('gives the general reader’s values on good files', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.tuple(goodNumber, goodNumber, goodNumber), { minLength: 20, maxLength: 60 }),
        fc.constantFrom('time[s],force[kN],extension[mm]', 'force[N],extension[mm],note', 'stress[MPa], strain[mm/mm] ', 'time[min],stress[ksi],strain[%]', 'x,force[kN],crosshead[in]'),
        fc.boolean(),
        async (rows, header, comments) => {
          // time must not go back: sort the first column when the header has a time channel
          const lines = rows.map((r, i) => (header.startsWith('time') ? [String(i), r[1], r[2]] : r).join(','));
          if (comments) lines.splice(3, 0, '# a comment', '');
          const file = write(`${header}\n${lines.join('\n')}\n`);
          const { fast, general } = await both(file);
          expectSame(fast, general);
          // canonical = value · factor (+ offset, not added when 0: -0 stays -0)
          if (header === 'time[s],force[kN],extension[mm]' && fast.ok)
            for (let i = 0; i < rows.length; i++) {
              expect(Object.is(fast.channels.force![i], Number(rows[i][1].trim()) * 1000)).toBe(true);
              expect(Object.is(fast.channels.extension![i], Number(rows[i][2].trim()) * 1 + 0)).toBe(true);
            }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('gives the general reader’s rejections on bad files', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.tuple(goodNumber, goodNumber, goodNumber), { minLength: 1, maxLength: 40 }),
        fc.nat(),
        badNumber,
        fc.nat(2),
        async (rows, at, bad, col) => {
          const lines = rows.map((r, i) => [String(i), r[1], r[2]]);
          if (lines.length) lines[at % lines.length][col] = bad;
          const file = write('time[s],force[kN],extension[mm]\n' + lines.map((l) => l.join(',')).join('\n') + '\n');
          const { fast, general } = await both(file);
          expectSame(fast, general);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('gives the general reader’s result on odd files', async () => {
    const rows = Array.from({ length: 25 }, (_, i) => `${i},${i * 2},${i / 4}`);
    const cases: (string | Uint8Array)[] = [
      '',
      '# only a comment\n',
      'time[s],force[kN],extension[mm]\n',
      'time[s],force[kN],extension[mm]\n' + rows.slice(0, 19).join('\n'),
      'time[s],force[kN],extension[mm]\n' + rows.join('\n'), // no final newline
      'time[s],force[kN],extension[mm]\r\n' + rows.join('\r\n') + '\r\n',
      '\ufefftime[s],force[kN],extension[mm]\n' + rows.join('\n') + '\n',
      'time[s],force[kN],extension[mm]\n' + rows.join('\n') + '\n1,2\n',
      'time[s],force[kN],extension[mm]\n' + rows.join('\n') + '\n1,2,3,4\n',
      'time[s],force[kN],extension[mm]\n' + [...rows.slice(0, 10), '3,1,1', ...rows.slice(10)].join('\n') + '\n',
      'time[s],force[kN],force[N],extension[mm]\n' + rows.map((r) => r + ',1').join('\n') + '\n',
      'time[s],force[furlong],extension[mm]\n' + rows.join('\n') + '\n',
      'time[s],force,extension[mm]\n' + rows.join('\n') + '\n',
      'time[s],stress[MPa]\n' + rows.map((r) => r.split(',').slice(0, 2).join(',')).join('\n') + '\n',
      'time[s],"force[kN]",extension[mm]\n' + rows.join('\n') + '\n',
      '   \ntime[s],force[kN],extension[mm]\n' + rows.join('\n') + '\n',
      'time[s],force[kN],extension[mm]\n' + rows.slice(0, 5).join('\n') + '\n  \n' + rows.slice(5).join('\n') + '\n',
      new Uint8Array([...new TextEncoder().encode('time[s],force[kN],extension[mm]\n' + rows.join('\n') + '\n'), 0xc3, 0x28, 0x0a]),
    ];
    for (const c of cases) {
      const { fast, general } = await both(write(c));
      expectSame(fast, general);
    }
  });
});
