// monitorSeries end to end on seeded, invented series: detection delay of a 1σ drop against the
// published ARLs, when each alert would have rung, change points, capability of individual
// tests, the chart's structure, defaults, degenerate input.
import { describe, expect, it } from 'vitest';
import { createMonitorRandom, cusumDecisionInterval, monitorSeries, orderSeriesPoints } from '../packages/stats/src/monitor/index.ts';
import type { SeriesPoint } from '../packages/stats/src/monitor/index.ts';

const DAY = 86_400_000;

function makeSeries(seed: number, n: number, meanMpa: number, sdMpa: number, drop: { at: number; byMpa: number } | null, heat = { size: 4, sd: 0 }): SeriesPoint[] {
  const rng = createMonitorRandom(seed);
  const t0 = Date.UTC(2024, 0, 8);
  let b = 0;
  return Array.from({ length: n }, (_, i) => {
    if (i % heat.size === 0) b = heat.sd * rng.normal();
    return {
      value: meanMpa + b + sdMpa * rng.normal() - (drop && i >= drop.at ? drop.byMpa : 0),
      date: new Date(t0 + i * DAY).toISOString().slice(0, 10),
      testId: `KV-${String(i + 1).padStart(4, '0')}`,
      heat: `H${7000 + Math.floor(i / heat.size)}`,
    };
  });
}

describe('a 1σ drop is caught within the expected delay', () => {
  it('mean delay of the self-starting CUSUM (k = 0.5, h = 5) and EWMA (λ = 0.1, L = 2.814) ≈ published ARL at 1σ', () => {
    // 200 seeded series: 100 in-control points, then a drop of one SD. The delay is the run
    // length from the first shifted point to the first signal. Published zero-state ARLs at 1σ:
    // CUSUM 10.4 (Montgomery), EWMA 10.3 (Lucas & Saccucci 1990). The charts start from the
    // state they are in at the shift, not from zero, and judge each point on the 100+ before it;
    // tolerance 3.5·SE of the mean delay plus 10 % for both (our allowance).
    const reps = 200;
    const dC: number[] = [];
    const dE: number[] = [];
    for (let k = 0; k < reps; k++) {
      const pts = makeSeries(700 + k, 160, 420, 12, { at: 100, byMpa: 12 }).map((p) => ({ ...p, heat: null }));
      const m = monitorSeries(pts, { cusum: { k: 0.5, h: 5 }, changePoint: { bootstrap: 0 } });
      const ic = m.points.findIndex((p, i) => i >= 100 && p.cusumLow > 5);
      const ie = m.points.findIndex((p, i) => i >= 100 && p.ewma !== null && p.ewmaLcl !== null && p.ewma < p.ewmaLcl);
      expect(ic).toBeGreaterThan(0);
      expect(ie).toBeGreaterThan(0);
      dC.push(ic - 99);
      dE.push(ie - 99);
      // The CUSUM signal is part of a cusum-low alert: detected on that test's date, or earlier
      // when the sum was already out (an episode is one alert).
      expect(m.alerts.some((x) => x.rule === 'cusum-low' && x.detected_on <= pts[ic].date && pts[ic].date <= x.last_date)).toBe(true);
    }
    for (const [d, arl] of [[dC, 10.4], [dE, 10.3]] as const) {
      const mean = d.reduce((s, x) => s + x, 0) / d.length;
      const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (d.length - 1));
      expect(Math.abs(mean - arl)).toBeLessThan((3.5 * sd) / Math.sqrt(d.length) + 0.1 * arl);
    }
  });
});

describe('alerts on one drifting supplier say when they would have rung', () => {
  // Invented scenario: yield of a "KV" series, 400 MPa mean, SD 12, heats of 4 without a heat
  // effect, grade minimum 370 MPa; from test 152 on (a new heat) the product drops by 18 MPa
  // (1.5 SD): 0.6 % of tests below the minimum before, 16 % after.
  const at = 152;
  const pts = makeSeries(4242, 250, 400, 12, { at, byMpa: 18 });
  const m = monitorSeries(pts, { lowerSpec: 370 });
  const shiftDate = pts[at].date;

  it('states its structure and design', () => {
    expect(m.status).toBe('ok');
    expect(m.structure?.unit).toBe('tests');
    expect(m.structure?.baseline.tests).toBe(100);
    expect(m.design).toMatchObject({ k: 0.5, arl0_tests: 1500, shewhart_arl0_tests: 5000, tests_per_point: 1, cusum_source: 'designed' });
    expect(m.design?.h).toBeCloseTo(cusumDecisionInterval(0.5, 1500), 12);
    expect(m.points).toHaveLength(250);
    expect(m.points.slice(0, 5).every((p) => p.u === null)).toBe(true); // warm-up: five points in first
    expect(m.capability).toHaveLength(250);
    expect(m.capabilitySettings).toEqual({ window: 50, min_tests: 20, max_fraction_below: 0.05, lower_spec: 370 });
  });

  it('raises a downward CUSUM alert soon after the drop, dated when it fires, with the estimated start before it', () => {
    const a = m.alerts.find((x) => x.rule === 'cusum-low' && x.detected_on >= shiftDate);
    expect(a).toBeDefined();
    if (!a) return;
    const k = pts.findIndex((p) => p.date === a.detected_on);
    expect(k - at).toBeLessThan(25);
    expect(m.points[k].cusumLow).toBeGreaterThan(m.design!.h);
    expect(m.points[k - 1].cusumLow).toBeLessThanOrEqual(m.design!.h);
    expect(a.change_date! <= a.detected_on).toBe(true);
    expect(Math.abs(Date.parse(a.change_date!) - Date.parse(shiftDate)) / DAY).toBeLessThan(10);
    // Montgomery's estimate k + C/N of the new mean, in MPa: near −18 (estimated, so a wide band)
    expect(a.magnitude).toBeLessThan(-7);
    expect(a.magnitude).toBeGreaterThan(-40);
    expect(a.magnitude_sd).toBeCloseTo(a.magnitude / m.structure!.test_sd, 12);
    expect(a.tests).toContain(pts[k].testId);
  });

  it('locates the change with an interval covering −18 MPa, and dates its alarm when the data up to then show it', () => {
    const down = m.changePoints.filter((c) => c.shift < 0);
    expect(down.length).toBeGreaterThanOrEqual(1);
    const c = down.reduce((best, x) => (Math.abs(Date.parse(x.date) - Date.parse(shiftDate)) < Math.abs(Date.parse(best.date) - Date.parse(shiftDate)) ? x : best));
    expect(Math.abs(Date.parse(c.date) - Date.parse(shiftDate)) / DAY).toBeLessThanOrEqual(12);
    expect(c.ci[0]).toBeLessThan(-18);
    expect(c.ci[1]).toBeGreaterThan(-18);
    expect(c.location_ci).not.toBeNull();
    expect(c.detected_on).not.toBeNull();
    expect(c.detected_on! >= shiftDate).toBe(true);
    const alert = m.alerts.find((x) => x.rule === 'change-point-down' && x.change_date === c.date);
    expect(alert?.detected_on).toBe(c.detected_on);
    expect(alert?.magnitude).toBeCloseTo(c.shift, 12);
  });

  it('every alert: estimated start ≤ detection ≤ end of the episode', () => {
    const rules = new Set(['individuals-below-lcl', 'individuals-above-ucl', 'mr-above-ucl', 'ewma-low', 'ewma-high', 'cusum-low', 'cusum-high', 'change-point-down', 'change-point-up', 'capability-below-minimum']);
    for (let i = 1; i < m.alerts.length; i++) expect(m.alerts[i].detected_on >= m.alerts[i - 1].detected_on).toBe(true);
    for (const a of m.alerts) {
      expect(rules.has(a.rule), a.rule).toBe(true);
      if (a.change_date !== null) expect(a.change_date <= a.detected_on).toBe(true);
      expect(a.detected_on <= a.last_date).toBe(true);
      expect(a.tests.length).toBeGreaterThan(0);
      expect(Number.isFinite(a.magnitude)).toBe(true);
    }
  });

  it('judges each test on the data before it: alerts up to a date do not change when later tests are dropped', () => {
    const cut = 200;
    const early = monitorSeries(pts.slice(0, cut), { lowerSpec: 370 });
    const sequential = (x: { rule: string }) => !x.rule.startsWith('change-point');
    const upTo = (list: typeof m.alerts) => list.filter((x) => sequential(x) && x.detected_on <= pts[cut - 1].date).map((x) => `${x.rule} ${x.detected_on} ${x.change_date}`);
    expect(upTo(early.alerts)).toEqual(upTo(m.alerts));
    expect(early.points.map((p) => p.u)).toEqual(m.points.slice(0, cut).map((p) => p.u));
  });

  it('capability of individual tests: the modelled share below the minimum crosses 5 % after the drop and alarms', () => {
    const before = m.capability[at - 1];
    const after = m.capability[249];
    // normal model: before Φ((370 − 400)/12) = 0.6 %, after Φ((370 − 382)/12) = 16 %
    expect(before.fraction_below as number).toBeLessThan(0.03);
    expect(after.fraction_below as number).toBeGreaterThan(0.06);
    expect(after.observed_below).toBeCloseTo(after.n_below / 50, 14);
    const cap = m.alerts.filter((x) => x.rule === 'capability-below-minimum');
    expect(cap.length).toBeGreaterThanOrEqual(1);
    expect(cap[0].detected_on >= shiftDate).toBe(true);
    expect(cap[0].magnitude_unit).toBe('fraction');
    expect(cap[0].magnitude).toBeGreaterThan(0.05);
  });
});

describe('the chart fits the data: heat means where heats differ', () => {
  it('charts heat means, each dated by its last test, with the SD of heat means', () => {
    const pts = makeSeries(31, 240, 400, 10, null, { size: 4, sd: 8 });
    const m = monitorSeries(pts);
    expect(m.structure?.unit).toBe('heat-means');
    expect(m.structure?.reason).toMatch(/heats differ/);
    expect(m.points).toHaveLength(60);
    expect(m.points[0]).toMatchObject({ label: 'heat H7000', size: 4, date: pts[3].date });
    expect(m.points[0].value).toBeCloseTo((pts[0].value + pts[1].value + pts[2].value + pts[3].value) / 4, 12);
    expect(m.structure!.point_sd).toBeLessThan(m.structure!.test_sd);
    // the CUSUM is designed for 1 SD of a test, in SDs of a heat mean, and its ARL counted in tests
    expect(m.design!.k).toBeCloseTo((m.structure!.test_sd / m.structure!.point_sd) / 2, 12);
    expect(m.design!.h).toBeCloseTo(cusumDecisionInterval(m.design!.k, 1500 / 4), 12);
  });
});

describe('options and degenerate input', () => {
  it('a given chart unit and CUSUM, and exact EWMA limits', () => {
    const pts = makeSeries(17, 80, 300, 8, null);
    const m = monitorSeries(pts, { unit: 'heat-means', cusum: { k: 0.5, h: 4 }, ewmaLimits: 'exact' });
    expect(m.structure?.decided).toBe('given');
    expect(m.points).toHaveLength(20);
    expect(m.design).toMatchObject({ k: 0.5, h: 4, cusum_source: 'given' });
    const widths = m.points.filter((p) => p.ewmaUcl !== null).map((p) => (p.ewmaUcl! - p.centre!) / p.scale!);
    expect(widths[0]).toBeLessThan(widths[widths.length - 1]);
  });

  it('an empty series and a non-finite value give error values', () => {
    const empty = monitorSeries([]);
    expect(empty.status).toBe('degenerate');
    expect(empty.errors[0].code).toBe('series-empty');
    const bad = makeSeries(2, 40, 300, 8, null);
    bad[7] = { ...bad[7], value: Number.NaN };
    const b = monitorSeries(bad);
    expect(b.status).toBe('degenerate');
    expect(b.errors[0]).toMatchObject({ code: 'value-not-finite', location: { index: 7 } });
    expect(b.points).toEqual([]);
    const none = monitorSeries(makeSeries(3, 40, 300, 8, null), { baseline: { from: '2031-01-01' } });
    expect(none.errors[0].code).toBe('baseline-empty');
  });

  it('a constant series charts nothing and raises nothing', () => {
    const flat = makeSeries(1, 40, 300, 8, null).map((p) => ({ ...p, value: 300 }));
    const f = monitorSeries(flat, { lowerSpec: 290 });
    expect(f.status).toBe('ok');
    expect(f.points.every((p) => p.u === null)).toBe(true);
    expect(f.alerts).toEqual([]);
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
