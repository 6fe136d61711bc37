// The monitor stage's alert rules on a seeded invented series (drift-simulation.ts): which chart
// signals become alerts toward the grade's limits, the catalog's capability threshold, and the
// contract dates of every alert.
import { describe, expect, it } from 'vitest';
import { analyzeDrift, CatalogError, parseCatalog } from '@fractile/pipeline';
import { simulatedRows, simulationCatalog, type DriftScenario } from '../packages/pipeline/src/monitor/drift-simulation.ts';

// 1.5 SD drop after test 150 of 300, minimum 2 SD below the mean: afterwards 31 % of tests below
const s: DriftScenario = { tests: 300, heatSize: 4, heatRatio: 0, stepSd: -1.5, stepAt: 150, marginSd: 2 };
const rows = simulatedRows(s, 77);
const run = (catalog = simulationCatalog(s), alertRules: 'toward-limits' | 'all' = 'toward-limits') =>
  analyzeDrift(rows, { by: ['supplier', 'grade'], properties: ['yield_mpa'], catalog, alertRules, monitor: { changePoint: { bootstrap: 0 } } });

describe('drift alert rules', () => {
  it('toward the limits: CUSUM, Shewhart, change point and capability; the EWMA and moving range only with all rules', () => {
    const toward = run();
    const rules = new Set(toward.alerts.map((a) => a.rule));
    expect(rules.has('cusum-low')).toBe(true);
    expect(rules.has('capability-below-minimum')).toBe(true);
    for (const r of rules) expect(['individuals-below-lcl', 'individuals-above-ucl', 'cusum-low', 'cusum-high', 'change-point-down', 'change-point-up', 'capability-below-minimum']).toContain(r);
    const all = run(simulationCatalog(s), 'all');
    expect(all.alerts.some((a) => a.rule === 'ewma-low')).toBe(true);
    expect(all.alerts.length).toBeGreaterThan(toward.alerts.length);
    for (const a of toward.alerts) {
      expect(a.first_date).toBe(a.detected_on);
      expect(a.id).toMatch(/^[0-9a-f]{12}$/);
      expect(a.chart).toBe('tests');
    }
  });

  it('a minimum without a maximum: downward rules only', () => {
    const c = simulationCatalog(s);
    const g = Object.keys(c.grades)[0];
    const lowerOnly = { grades: { [g]: { ...c.grades[g], spec: { yield_min_mpa: c.grades[g].spec.yield_min_mpa } } } };
    expect(run(lowerOnly).alerts.every((a) => !/high|above|-up$/.test(a.rule))).toBe(true);
  });

  it("the capability alert fires above the catalog's max_fraction_below (default 0.05), not below it", () => {
    const c = simulationCatalog(s);
    const g = Object.keys(c.grades)[0];
    const cap = (share?: number) => run({ grades: { [g]: { ...c.grades[g], ...(share === undefined ? {} : { max_fraction_below: share }) } } }).alerts.filter((a) => a.rule === 'capability-below-minimum');
    const dflt = cap();
    expect(dflt.length).toBeGreaterThan(0);
    expect(dflt.every((a) => a.magnitude > 0.05 && a.magnitude_unit === 'fraction')).toBe(true);
    // the shifted process puts 31 % below the minimum: a 60 % threshold is never crossed
    expect(cap(0.6)).toEqual([]);
    expect(cap(0.01)[0].detected_on <= dflt[0].detected_on).toBe(true);
  });

  it('the catalog checks max_fraction_below', () => {
    const grade = { family: 'steel', spec: { yield_min_mpa: 355 } };
    expect(parseCatalog({ grades: { G: { ...grade, max_fraction_below: 0.02 } } }).grades.G.max_fraction_below).toBe(0.02);
    expect(parseCatalog({ grades: { G: grade } }).grades.G.max_fraction_below).toBeUndefined();
    expect(() => parseCatalog({ grades: { G: { ...grade, max_fraction_below: 1.5 } } })).toThrow(CatalogError);
    expect(() => parseCatalog({ grades: { G: { ...grade, max_fraction_below: '5 %' } } })).toThrow(/max_fraction_below must be a number between 0 and 1/);
  });
});
