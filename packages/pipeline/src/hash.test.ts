import { describe, expect, it } from 'vitest';
import { canonicalJson, hashOf, sha256Hex } from './hash.ts';

describe('settings hash', () => {
  it('is independent of key order and ignores undefined', () => {
    expect(canonicalJson({ b: 1, a: [1, { d: 2, c: 3 }], u: undefined })).toBe('{"a":[1,{"c":3,"d":2}],"b":1}');
    expect(hashOf({ x: 1, y: 2 })).toBe(hashOf({ y: 2, x: 1 }));
    expect(hashOf({ x: 1 })).not.toBe(hashOf({ x: 2 }));
  });
  it('is SHA-256 (FIPS 180-4 test vector "abc")', () => {
    // FIPS 180-4, Appendix B.1: SHA-256("abc")
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});
