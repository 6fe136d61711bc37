import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { AsciiBuffer } from './ascii-buffer.ts';

const print = (x: number, d: number, point?: number): string => {
  const b = new AsciiBuffer(4);
  b.fixed(x, d, point);
  return b.bytes().toString('latin1');
};

describe('fixed-decimal ASCII printing', () => {
  it('agrees with Number.prototype.toFixed (ECMA-262) away from rounding ties', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 6 }), (x, d) => {
        const scaled = Math.abs(x) * 10 ** d;
        // a tie in binary may round either way; toFixed rounds the exact decimal expansion
        fc.pre(Math.abs(scaled - Math.floor(scaled) - 0.5) > 1e-6);
        const ref = x.toFixed(d);
        expect(print(x, d)).toBe(/^-0\.?0*$/.test(ref) ? ref.slice(1) : ref);
      }),
      { numRuns: 5000 },
    );
  });

  it('prints small cases, a decimal comma, no negative zero, and non-finite values', () => {
    expect(print(0, 3)).toBe('0.000');
    expect(print(-0.0001, 3)).toBe('0.000');
    expect(print(0.0105, 4)).toBe('0.0105');
    expect(print(-12.5, 0)).toBe('-13');
    expect(print(1234.5678, 2, 0x2c)).toBe('1234,57');
    expect(print(NaN, 2)).toBe('NaN');
    expect(print(-Infinity, 2)).toBe('-Infinity');
    const b = new AsciiBuffer(2);
    for (let i = 0; i < 1000; i++) {
      b.fixed(i / 7, 3);
      b.byte(0x0a);
    }
    expect(b.bytes().toString('latin1').split('\n')[999]).toBe((999 / 7).toFixed(3));
  });
});
