// Moving-range constants, baseline selection, EWMA and CUSUM charts: constants from the exact
// laws, recursions against SciPy/numpy, and exact-arithmetic properties.
import { describe, expect, it } from 'vitest';
import {
  MR_D2,
  MR_D4,
  createMonitorRandom,
  cusumChart,
  ewmaChart,
  ewmaHalfWidth,
  movingRanges,
  selectBaseline,
} from '../packages/stats/src/monitor/index.ts';
import type { SeriesPoint } from '../packages/stats/src/monitor/index.ts';
import { scipy } from './monitor-scipy.ts';

function points(values: number[], start = Date.UTC(2024, 2, 1)): SeriesPoint[] {
  return values.map((value, i) => ({ value, date: new Date(start + i * 86400000).toISOString().slice(0, 10), testId: `H${100 + i}` }));
}

describe('moving ranges (Montgomery) and the baseline', () => {
  it("Montgomery's constants follow from the normal law for ranges of 2", () => {
    // Exact law: X1 − X2 ~ N(0, 2σ²), so E|X1 − X2| = 2σ/√π (d2) and SD|X1 − X2| = σ√(2 − 4/π) (d3).
    const d2 = 2 / Math.sqrt(Math.PI);
    const d3 = Math.sqrt(2 - 4 / Math.PI);
    expect(Math.abs(MR_D2 - d2)).toBeLessThan(5e-4); // 1.128 as printed
    expect(Math.abs(MR_D4 - (1 + (3 * d3) / d2))).toBeLessThan(5e-4); // 3.267 as printed
  });

  it('moving ranges equal numpy.abs(numpy.diff(x)), the first one missing', () => {
    const rng = createMonitorRandom(3);
    const v = Array.from({ length: 45 }, () => 355 + 11 * rng.normal());
    const ref = scipy<number[]>('out = np.abs(np.diff(np.asarray(data))).tolist()', v);
    const mr = movingRanges(v);
    expect(mr[0]).toBeNull();
    ref.forEach((r, i) => expect(mr[i + 1]).toBeCloseTo(r, 12));
  });

  it('baseline selection: first 100 by default, first N, a date range, a range capped by N', () => {
    const p = points(Array.from({ length: 150 }, (_, i) => i));
    expect(selectBaseline(p)).toEqual({ start: 0, end: 99 });
    expect(selectBaseline(p.slice(0, 12))).toEqual({ start: 0, end: 11 });
    expect(selectBaseline(p, { firstN: 20 })).toEqual({ start: 0, end: 19 });
    expect(selectBaseline(p, { from: p[5].date, to: p[14].date })).toEqual({ start: 5, end: 14 });
    expect(selectBaseline(p, { from: p[5].date, firstN: 4 })).toEqual({ start: 5, end: 8 });
    expect(selectBaseline(p, { from: '2030-01-01' })).toBeNull();
    expect(selectBaseline([])).toBeNull();
  });
});

describe('EWMA (Roberts 1959; Lucas & Saccucci 1990)', () => {
  it('the recursion equals scipy.signal.lfilter([λ], [1, −(1 − λ)], z)', () => {
    const rng = createMonitorRandom(5);
    const z = Array.from({ length: 200 }, () => rng.normal() + 0.3);
    const ref = scipy<number[]>('from scipy import signal\nout = signal.lfilter([0.2], [1, -0.8], np.asarray(data)).tolist()', z);
    const ew = ewmaChart(z, { lambda: 0.2, L: 3 }, 'asymptotic');
    ref.forEach((r, i) => expect(ew.ewma[i]).toBeCloseTo(r, 12));
  });

  it('exact limits: variance λ²·Σ_{j<i}(1 − λ)^{2j} (exact law), tending to λ/(2 − λ)', () => {
    const p = { lambda: 0.1, L: 2.814 };
    for (const i of [1, 2, 5, 20, 200]) {
      let v = 0;
      for (let j = 0; j < i; j++) v += 0.01 * 0.9 ** (2 * j);
      expect(ewmaHalfWidth(p, i, 'exact')).toBeCloseTo(2.814 * Math.sqrt(v), 12);
    }
    expect(ewmaHalfWidth(p, 1, 'asymptotic')).toBeCloseTo(2.814 * Math.sqrt(0.1 / 1.9), 12);
    // A step z = −2.5 from the start: w_i = −2.5·(1 − 0.9^i) = −0.25, −0.475, −0.6775, …
    // Exact half-widths 0.2814, 0.3786, … → first out at i = 2; asymptotic 0.6456 → at i = 3.
    const z = new Array(10).fill(-2.5);
    const ew = ewmaChart(z, p, 'exact');
    expect(ew.halfWidth[0]).toBeCloseTo(2.814 * 0.1, 12);
    expect(ew.ewma[2]).toBeCloseTo(-2.5 * (1 - 0.729), 12);
    expect(Array.from(ew.outLow).indexOf(1)).toBe(1);
    expect(Array.from(ewmaChart(z, p, 'asymptotic').outLow).indexOf(1)).toBe(2);
    expect(ew.outHigh.every((x) => x === 0)).toBe(true);
  });
});

describe('tabular CUSUM (Page 1954; Montgomery)', () => {
  it('a noise-free step of δ > k signals first at i = ⌊h/(δ − k)⌋ + 1 (exact arithmetic)', () => {
    for (const [delta, k, h] of [[1, 0.5, 5], [1.5, 0.5, 4], [0.75, 0.5, 5]]) {
      const z = new Array(60).fill(-delta);
      const c = cusumChart(z, { k, h });
      expect(Array.from(c.outLow).indexOf(1) + 1).toBe(Math.floor(h / (delta - k)) + 1);
      expect(c.outHigh.every((x) => x === 0)).toBe(true);
      expect(c.low[9]).toBeCloseTo(10 * (delta - k), 12);
      expect(c.nLow[9]).toBe(10);
    }
  });

  it('values within ±k never accumulate', () => {
    const c = cusumChart([0.5, -0.5, 0.2, -0.4, 0.49], { k: 0.5, h: 5 });
    expect(Array.from(c.high)).toEqual([0, 0, 0, 0, 0]);
    expect(Array.from(c.low)).toEqual([0, 0, 0, 0, 0]);
  });
});
