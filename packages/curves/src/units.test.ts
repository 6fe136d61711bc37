/**
 * Unit conversion against NIST SP 811 (Guide for the Use of the International System of Units,
 * 2008), Appendix B.8/B.9. The exact definitions behind the table: 1 in = 0.0254 m; 1 lb =
 * 0.45359237 kg and standard gravity gₙ = 9.80665 m/s², so 1 lbf = 4.4482216152605 N; 1 psi =
 * 1 lbf/in²; t/°C = (t/°F − 32)/1.8; t/°C = T/K − 273.15. Table values (7 significant digits) are
 * checked as printed: 1 lbf = 4.448 222 E+00 N, 1 psi = 6.894 757 E+03 Pa, 1 ksi = 6.894 757 E+06 Pa,
 * 1 in² = 6.4516 E−04 m² (exact), 1 kip = 4.448 222 E+03 N.
 */
import { describe, expect, it } from 'vitest';
import { caseHint, channelToCanonical, IN_MM, KSI_MPA, LBF_N, lookupUnit, toCanonical, unitFor } from './units.ts';

/** |a − b| ≤ rel·|b| */
const relClose = (a: number, b: number, rel: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));

describe('NIST SP 811 factors', () => {
  it('length and area: 1 in = 25.4 mm and 1 in² = 645.16 mm², exactly', () => {
    expect(IN_MM).toBe(25.4);
    expect(unitFor('length', 'in')!.factor).toBe(25.4);
    expect(unitFor('area', 'in2')!.factor).toBeCloseTo(645.16, 12);
    expect(unitFor('length', 'm')!.factor).toBe(1000);
    expect(unitFor('length', 'um')!.factor).toBe(1e-3);
  });

  it('force: 1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N; table 4.448 222 E+00', () => {
    relClose(LBF_N, 0.45359237 * 9.80665, 1e-15);
    expect(LBF_N.toPrecision(7)).toBe('4.448222');
    expect(unitFor('force', 'lbf')!.factor).toBe(LBF_N);
    relClose(unitFor('force', 'kip')!.factor, 4448.2216152605, 1e-15);
    expect((unitFor('force', 'kip')!.factor).toPrecision(7)).toBe('4448.222');
    expect(unitFor('force', 'kN')!.factor).toBe(1000);
  });

  it('stress: 1 psi = 1 lbf/in² (table 6.894 757 E+03 Pa), 1 ksi = 1000 psi', () => {
    const psiMpa = unitFor('stress', 'psi')!.factor;
    // derived from the exact lbf and inch factors: 6.894757293168361… × 10⁻³ MPa
    relClose(psiMpa, LBF_N / (25.4 * 25.4), 1e-15);
    expect((psiMpa * 1e6).toPrecision(7)).toBe('6894.757'); // Pa
    relClose(KSI_MPA, (1000 * LBF_N) / (25.4 * 25.4), 1e-15);
    relClose(KSI_MPA, 6.894757293168361, 1e-15);
    expect(unitFor('stress', 'ksi')!.factor).toBe(KSI_MPA);
    expect(unitFor('stress', 'GPa')!.factor).toBe(1000);
    expect(unitFor('stress', 'N/mm2')!.factor).toBe(1);
    expect(unitFor('stress', 'Pa')!.factor).toBe(1e-6);
  });

  it('temperature: °F and K to °C by the defining relations', () => {
    const f = unitFor('temperature', 'F')!;
    expect(toCanonical(212, f)).toBeCloseTo(100, 12);
    expect(toCanonical(32, f)).toBeCloseTo(0, 12);
    expect(toCanonical(-40, f)).toBeCloseTo(-40, 12);
    expect(toCanonical(273.15, unitFor('temperature', 'K')!)).toBeCloseTo(0, 12);
    expect(toCanonical(20, unitFor('temperature', 'C')!)).toBe(20);
  });

  it('strain and time: % is 1/100, ms and min to s', () => {
    expect(unitFor('strain', '%')!.factor).toBe(0.01);
    expect(unitFor('strain', 'mm/mm')!.factor).toBe(1);
    expect(unitFor('percent', '%')!.factor).toBe(1);
    expect(unitFor('time', 'ms')!.factor).toBe(1e-3);
    expect(unitFor('time', 'min')!.factor).toBe(60);
  });
});

describe('unit lookup', () => {
  it('matches symbols exactly (SI symbols are case-sensitive), ignoring surrounding space', () => {
    expect(lookupUnit(' kN ')!.factor).toBe(1000);
    expect(lookupUnit('MPa')!.canonical).toBe('MPa');
    expect(unitFor('area', 'mm²')!.factor).toBe(1);
    // SI Brochure (9th ed., 2019) §5.2: prefix symbols are case-sensitive — m (milli) is not M
    // (mega), so mPa is not MPa and Mm is not mm; neither is read as the other
    for (const wrong of ['mPa', 'MPA', 'mpa', 'Mm', 'MM', 'KN', 'kn', 'n', 'S', 'gpa']) expect(lookupUnit(wrong), wrong).toBeNull();
    expect(unitFor('stress', 'mPa')).toBeNull();
    expect(unitFor('length', 'Mm')).toBeNull();
    expect(caseHint('mPa')).toBe('MPa');
    expect(caseHint('Mm')).toBe('mm');
    expect(caseHint('KN')).toBe('kN');
    expect(caseHint('MPa')).toBeNull();
    expect(caseHint('furlong')).toBeNull();
  });

  it('returns null for an unknown unit or one of another quantity, never a guess', () => {
    expect(lookupUnit('furlong')).toBeNull();
    expect(lookupUnit('')).toBeNull();
    expect(unitFor('force', 'mm')).toBeNull();
    expect(unitFor('stress', 'kN')).toBeNull();
    expect(unitFor('percent', 'mm/mm')).toBeNull();
  });

  it('converts a whole channel into a new array', () => {
    const src = [0, 1, 2.5];
    const out = channelToCanonical(src, unitFor('force', 'lbf')!);
    expect(out).toBeInstanceOf(Float64Array);
    expect(Array.from(out)).toEqual([0, LBF_N, 2.5 * LBF_N]);
    expect(src).toEqual([0, 1, 2.5]);
    expect(Array.from(channelToCanonical([212], unitFor('temperature', 'F')!))[0]).toBeCloseTo(100, 12);
  });
});
