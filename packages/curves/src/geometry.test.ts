/**
 * S0 per ISO 6892-1: round specimens π·d²/4, flat (rectangular) specimens a·b, or the area given;
 * missing, zero, negative or non-finite dimensions give an error value, never NaN.
 * Check values are computed from the formula by hand: d = 10 mm → 25π = 78.539816… mm²;
 * d = 1 in = 25.4 mm → 161.29π = 506.70747909749… mm².
 */
import { describe, expect, it } from 'vitest';
import { crossSectionArea } from './geometry.ts';

const area = (r: ReturnType<typeof crossSectionArea>) => (r.ok ? r.areaMm2 : Number.NaN);

describe('crossSectionArea (ISO 6892-1 S0)', () => {
  it('round: π·d²/4', () => {
    expect(area(crossSectionArea({ shape: 'round', diameterMm: 10 }))).toBeCloseTo(25 * Math.PI, 12);
    expect(area(crossSectionArea({ shape: 'round', diameterMm: 10 }))).toBeCloseTo(78.53981633974483, 12);
    expect(area(crossSectionArea({ shape: 'round', diameterMm: 25.4 }))).toBeCloseTo(506.7074790974977, 10);
  });

  it('flat: thickness × width', () => {
    expect(area(crossSectionArea({ shape: 'flat', thicknessMm: 2, widthMm: 12.5 }))).toBe(25);
    expect(area(crossSectionArea({ shape: 'flat', thicknessMm: 0.8, widthMm: 20 }))).toBeCloseTo(16, 14);
  });

  it('area: taken as given, other dimensions ignored', () => {
    expect(area(crossSectionArea({ shape: 'area', areaMm2: 50.3, diameterMm: 99 }))).toBe(50.3);
  });

  it('missing dimension names the field', () => {
    expect(crossSectionArea({ shape: 'round' })).toMatchObject({ ok: false, code: 'missing_dimension', field: 'diameter' });
    expect(crossSectionArea({ shape: 'flat', thicknessMm: 2 })).toMatchObject({ ok: false, code: 'missing_dimension', field: 'width' });
    expect(crossSectionArea({ shape: 'flat', widthMm: 2, thicknessMm: null })).toMatchObject({ ok: false, code: 'missing_dimension', field: 'thickness' });
    expect(crossSectionArea({ shape: 'area', diameterMm: 10 })).toMatchObject({ ok: false, code: 'missing_dimension', field: 'area' });
    expect(crossSectionArea({ shape: 'round', diameterMm: Number.NaN })).toMatchObject({ ok: false, code: 'missing_dimension', field: 'diameter' });
  });

  it('zero, negative or infinite dimensions are rejected', () => {
    expect(crossSectionArea({ shape: 'round', diameterMm: 0 })).toMatchObject({ ok: false, code: 'nonpositive_dimension', field: 'diameter' });
    expect(crossSectionArea({ shape: 'flat', thicknessMm: 2, widthMm: -3 })).toMatchObject({ ok: false, code: 'nonpositive_dimension', field: 'width' });
    expect(crossSectionArea({ shape: 'area', areaMm2: Number.POSITIVE_INFINITY })).toMatchObject({ ok: false, code: 'nonpositive_dimension', field: 'area' });
    const r = crossSectionArea({ shape: 'round', diameterMm: -1 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toContain('diameter');
  });
});
