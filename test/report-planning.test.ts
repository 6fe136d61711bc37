/**
 * The report's sample-size planning section, from plans the pipeline computes on an invented
 * group (planGroups on generated rows): one table and one inline SVG chart per planned property,
 * the value now equal to the stats headline (the same rule recomputed), numbers formatted with
 * their units, the factors falling with n, a property without a plan listed with its reason,
 * hostile text escaped, and the section linked from the summary.
 */
import { describe, expect, it } from 'vitest';
import { aggregateRows, planGroups, type PropertyRow } from '@fractile/pipeline';
import { renderReport } from '@fractile/report';
import { sampleReportData } from '../packages/report/src/testing/sample-report-data.ts';
import { mulberry32 } from './support/random.ts';

const HOSTILE = '<b onmouseover=alert(1)>Mill</b>';

function rows(n: number): PropertyRow[] {
  const u = mulberry32(21);
  const z = () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  return Array.from({ length: n }, (_, i) => {
    const y = 355 + 18 * z();
    return {
      lab: 'L', test_id: `P${i}`, grade: 'FX-9', supplier: HOSTILE, heat: null, tested_on: '2025-02-01', modulus_gpa: 206, rp02_mpa: y, rt05_mpa: null, reh_mpa: null, rel_mpa: null,
      ype_pct: null, rm_mpa: y / 0.78 + 9 * z(), ag_pct: i < 3 ? 14 + z() : null, agt_pct: null, a_pct: null, yt_ratio: null, n_value: null, k_mpa: null, yield_mpa: y,
      yield_definition: 'rp0.2', shape_class: 'continuous', flags: [], given: false, failure: null, orientation: null, temperature_c: null, shape: null, test_pk: i + 1, settings_hash: 'h',
    };
  });
}

describe('report: sample-size planning section', async () => {
  const r = rows(24);
  const agg = aggregateRows(r, { by: ['grade', 'supplier'], catalog: null, properties: ['yield_mpa', 'rm_mpa', 'ag_pct'] });
  const planning = planGroups(agg, r, { by: ['grade', 'supplier'], properties: ['yield_mpa', 'rm_mpa', 'ag_pct'], added: [10, 20, 50], replicates: 400, seed: 2 });
  const base = sampleReportData({ groups: 1, properties: 2, controlCharts: 0 });
  const html = await renderReport({ ...base, planning });
  const section = html.slice(html.indexOf('<section class="block" id="planning">'), html.indexOf('id="quality"'));

  it('recomputes the headline: the value now is the stats design value', () => {
    for (const p of planning.filter((x) => x.plan)) {
      const s = agg.stats.find((x) => x.property === p.property)!;
      expect(p.plan!.value_now).toBeCloseTo(s.headline!.value!, 8);
      expect(p.plan!.method).toBe('lowest-model');
      const k = p.plan!.rows.map((row) => row.factors.k!);
      for (let i = 1; i < k.length; i++) expect(k[i]).toBeLessThan(k[i - 1]);
    }
  });

  it('has one table and one chart per planned property, and lists the property without a plan', () => {
    expect(planning.filter((p) => p.plan)).toHaveLength(2);
    expect(section.split('<svg ').length - 1).toBe(2);
    expect(section.split('<table').length - 1).toBe(2);
    expect(section).toContain('Not planned');
    expect(section).toMatch(/Ag: no design value/);
    // the rows: tests now and with 10, 20, 50 more; the value now in the range column
    for (const n of [24, 34, 44, 74]) expect(section).toContain(`<td class="num">${n}</td>`);
    expect(section).toContain('<td class="num">now</td>');
    expect(section).toContain('tests [count]');
    expect(section).toContain('design value: yield [MPa]');
  });

  it('escapes the group text and is linked from the summary', () => {
    expect(section).not.toContain('<b onmouseover');
    expect(section).toContain('&lt;b onmouseover=alert(1)&gt;Mill&lt;/b&gt;');
    expect(html).toContain('<a href="#planning">Sample-size planning</a>');
  });

  it('says so when no planning was computed', async () => {
    const none = await renderReport(base);
    expect(none).toContain('No planning was computed.');
  });
});
