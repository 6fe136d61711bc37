// monitorSeries end to end on seeded, invented series: detection delay of a 1σ drop against the
// published ARLs, alert contents, change points, capability, defaults, degenerate input, speed.
import { describe, expect, it } from 'vitest';
import { createMonitorRandom, monitorSeries, orderSeriesPoints } from '../packages/stats/src/monitor/index.ts';
import type { SeriesPoint } from '../packages/stats/src/monitor/index.ts';

function makeSeries(seed: number, n: number, meanMpa: number, sdMpa: number, drop: { at: number; byMpa: number } | null): SeriesPoint[] {
  const rng = createMonitorRandom(seed);
  const t0 = Date.UTC(2024, 0, 8);
  return Array.from({ length: n }, (_, i) => ({
    value: meanMpa + sdMpa * rng.normal() - (drop && i >= drop.at ? drop.byMpa : 0),
    date: new Date(t0 + Math.floor(i / 2) * 86400000).toISOString().slice(0, 10),
    testId: `KV-${String(i + 1).padStart(4, '0')}`,
    heat: `H${7000 + Math.floor(i / 4)}`,
  }));
}

describe('a 1σ drop is caught within the expected delay', () => {
  it('mean delay of CUSUM (k = 0.5, h = 5) and EWMA (λ = 0.1, L = 2.814) ≈ published ARL at 1σ', () => {
    // 200 seeded series: 100 in-control baseline points, then a drop of one SD. The delay is the
    // run length from the first shifted point to the first signal. Published zero-state ARLs at
    // 1σ: CUSUM 10.4 (Montgomery), EWMA 10.3 (Lucas & Saccucci 1990). Tolerance: 3.5·SE of the
    // mean delay plus a 10 % allowance for estimating the baseline mean and sigma from 100 points
    // (our allowance; the charts here use estimated, not known, parameters).
    const reps = 200;
    const dC: number[] = [];
    const dE: number[] = [];
    for (let k = 0; k < reps; k++) {
      const pts = makeSeries(700 + k, 160, 420, 12, { at: 100, byMpa: 12 });
      const m = monitorSeries(pts, { baseline: { firstN: 100 }, changePoint: { bootstrap: 0 } });
      const lim = m.ewmaLimits as { ucl: number; lcl: number };
      const ic = m.points.findIndex((p, i) => i >= 100 && p.cusumLow > m.cusumH);
      const ie = m.points.findIndex((p, i) => i >= 100 && p.ewma < lim.lcl);
      expect(ic).toBeGreaterThan(0);
      expect(ie).toBeGreaterThan(0);
      dC.push(ic - 99);
      dE.push(ie - 99);
      // The CUSUM signal is reported as a cusum-low alert on that very test.
      const a = m.alerts.find((x) => x.rule === 'cusum-low' && x.first_index <= ic && x.last_index >= ic);
      expect(a).toBeDefined();
    }
    for (const [d, arl] of [[dC, 10.4], [dE, 10.3]] as const) {
      const mean = d.reduce((s, x) => s + x, 0) / d.length;
      const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (d.length - 1));
      expect(Math.abs(mean - arl)).toBeLessThan((3.5 * sd) / Math.sqrt(d.length) + 0.1 * arl);
    }
  });
});

describe('alerts and change points on one drifting supplier', () => {
  // Invented scenario: yield of a "KV" series, 400 MPa mean, SD 12, grade minimum 355 MPa; from
  // test 151 on the mill's product drops by 18 MPa (1.5 SD).
  const pts = makeSeries(4242, 250, 400, 12, { at: 150, byMpa: 18 });
  const m = monitorSeries(pts, { lowerSpec: 355 });

  it('states its defaults', () => {
    expect(m.status).toBe('ok');
    expect(m.baseline.n).toBe(30);
    expect(m.ewma).toEqual({ lambda: 0.1, L: 2.814, limits: 'asymptotic' });
    expect(m.cusum).toEqual({ k: 0.5, h: 5 });
    expect(m.cusumH).toBe(5);
    expect(m.changePointSettings.penalty).toBeCloseTo(2 * Math.log(250), 12);
    expect(m.points).toHaveLength(250);
    expect(m.capability).toHaveLength(250);
  });

  it('raises downward CUSUM and EWMA alerts soon after the drop, with the tests involved', () => {
    for (const rule of ['cusum-low', 'ewma-low']) {
      const a = m.alerts.find((x) => x.rule === rule && x.first_index >= 150);
      expect(a, rule).toBeDefined();
      if (!a) continue;
      expect(a.first_index - 150).toBeLessThan(40);
      expect(a.first_date).toBe(pts[a.first_index].date);
      expect(a.magnitude).toBeLessThan(0);
      expect(a.magnitude_unit).toBe('sd');
      expect(a.tests).toContain(pts[a.first_index].testId);
    }
    const cu = m.alerts.find((x) => x.rule === 'cusum-low' && x.first_index >= 150);
    // Montgomery's shift estimate k + C/N is in SD units and near the true −1.5 SD (baseline sigma
    // is itself estimated from 30 points, so allow a wide band).
    expect(cu?.magnitude).toBeGreaterThan(-3.5);
    expect(cu?.magnitude).toBeLessThan(-0.6);
  });

  it('locates the change with an interval of the shift covering −18 MPa and a location interval', () => {
    const down = m.changePoints.filter((c) => c.shift < 0);
    expect(down.length).toBeGreaterThanOrEqual(1);
    const c = down.reduce((best, x) => (Math.abs(x.index - 150) < Math.abs(best.index - 150) ? x : best));
    expect(Math.abs(c.index - 150)).toBeLessThanOrEqual(10);
    expect(c.ci[0]).toBeLessThan(-18);
    expect(c.ci[1]).toBeGreaterThan(-18);
    expect(c.location_ci).not.toBeNull();
    const loc = c.location_ci as NonNullable<typeof c.location_ci>;
    expect(loc.date[0] <= c.date && c.date <= loc.date[1]).toBe(true);
    const alert = m.alerts.find((x) => x.rule === 'change-point-down' && x.first_index === c.index);
    expect(alert?.magnitude).toBeCloseTo(c.shift, 12);
    expect(alert?.magnitude_unit).toBe('property-units');
  });

  it('tracks the capability margin toward the grade minimum and alerts when Cpk falls below 1.33', () => {
    const before = m.capability[140];
    const after = m.capability[249];
    // Before: mean 400, SD 12 → margin ≈ 3.75 SD; after: 382 → ≈ 2.25 SD (normal model).
    expect(before.margin_sd as number).toBeGreaterThan(2.9);
    expect(after.margin_sd as number).toBeLessThan(3.1);
    expect(after.fraction_below as number).toBeGreaterThan(before.fraction_below as number);
    const cap = m.alerts.filter((x) => x.rule === 'capability-margin' && x.last_index === 249);
    expect(cap).toHaveLength(1);
    expect(cap[0].magnitude_unit).toBe('sd');
  });

  it('alerts are in time order and every rule name is one of the documented ones', () => {
    const rules = new Set(['individuals-below-lcl', 'individuals-above-ucl', 'mr-above-ucl', 'ewma-low', 'ewma-high', 'cusum-low', 'cusum-high', 'change-point-down', 'change-point-up', 'capability-margin']);
    for (let i = 1; i < m.alerts.length; i++) expect(m.alerts[i].first_index).toBeGreaterThanOrEqual(m.alerts[i - 1].first_index);
    for (const a of m.alerts) {
      expect(rules.has(a.rule), a.rule).toBe(true);
      expect(a.tests.length).toBeGreaterThan(0);
      expect(Number.isFinite(a.magnitude)).toBe(true);
    }
  });
});

describe('options and degenerate input', () => {
  it('a date-range baseline and exact EWMA limits', () => {
    const pts = makeSeries(17, 80, 300, 8, null);
    const m = monitorSeries(pts, { baseline: { from: pts[10].date, to: pts[49].date }, ewmaLimits: 'exact' });
    expect(m.baseline.start).toBe(10);
    expect(m.baseline.end).toBe(49);
    const lim = m.ewmaLimits as { ucl: number[]; lcl: number[] };
    expect(lim.ucl).toHaveLength(80);
    expect(lim.ucl[0]).toBeLessThan(lim.ucl[79]);
    expect(lim.lcl[5]).toBe(-lim.ucl[5]);
  });

  it('an empty series, a constant baseline and a non-finite value give error values', () => {
    const empty = monitorSeries([]);
    expect(empty.status).toBe('degenerate');
    expect(empty.errors[0].code).toBe('series-empty');
    const flat = makeSeries(1, 40, 300, 8, null).map((p, i) => (i < 30 ? { ...p, value: 300 } : p));
    const f = monitorSeries(flat);
    expect(f.status).toBe('degenerate');
    expect(f.errors.map((e) => e.code)).toEqual(['baseline-no-spread']);
    expect(f.points).toEqual([]);
    const bad = makeSeries(2, 40, 300, 8, null);
    bad[7] = { ...bad[7], value: Number.NaN };
    const b = monitorSeries(bad);
    expect(b.errors[0]).toMatchObject({ code: 'value-not-finite', location: { index: 7 } });
  });
});

describe('orderSeriesPoints', () => {
  it('orders by test date, then heat, then test id, without changing the input', () => {
    const input: SeriesPoint[] = [
      { value: 1, date: '2024-03-02', testId: 'B', heat: 'H2' },
      { value: 2, date: '2024-03-01', testId: 'C', heat: 'H9' },
      { value: 3, date: '2024-03-02', testId: 'A', heat: 'H1' },
      { value: 4, date: '2024-03-02', testId: 'D', heat: null },
      { value: 5, date: '2024-03-02', testId: 'C', heat: 'H1' },
    ];
    const out = orderSeriesPoints(input);
    expect(out.map((p) => p.value)).toEqual([2, 4, 3, 5, 1]);
    expect(input[0].value).toBe(1);
  });
});
