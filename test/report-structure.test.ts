/**
 * Structure of the HTML report: a section per group, every chart an inline SVG, the caution at
 * top and bottom, formatted table numbers, escaping of hostile text, truncated long lists, no
 * external references, unique element ids, same input → same page, and render time at demo size.
 */
import { describe, expect, it } from 'vitest';
import { DESIGN_VALUE_CAUTION, renderReport, type ReportData } from '@fractile/report';
import { sampleReportData } from '../packages/report/src/testing/sample-report-data.ts';

const HOSTILE = `<script>alert("x")</script> & 'Sons' <img src=x onerror=alert(1)>`;

function count(haystack: string, needle: string): number {
  return haystack.split(needle).length - 1;
}

describe('report structure', async () => {
  const data = sampleReportData({ groups: 3, properties: 4, controlCharts: 3, firstSupplier: HOSTILE });
  const html = await renderReport(data);

  it('is one HTML document with a section per group and one inline SVG per chart', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html.trimEnd().endsWith('</html>')).toBe(true);
    expect(count(html, '<section class="block group"')).toBe(3);
    for (let i = 1; i <= 3; i++) expect(html).toContain(`id="group-${i}"`);
    // per group: curves chart + one histogram per property; one control chart per series, and the
    // supplier comparison of the one grade and property compared
    const charts = 3 * (1 + 4) + 3 + 1;
    expect(count(html, '<svg ')).toBe(charts);
    expect(count(html, '<figure ')).toBe(charts);
    const figures = html.match(/<figure [^>]*>[\s\S]*?<\/figure>/g)!;
    expect(figures.every((f) => /^<figure [^>]*><svg /.test(f))).toBe(true);
    expect(html).toContain('id="drift"');
    // alert magnitude with its unit
    expect(html).toContain('<td class="num">−22.0 MPa</td>');
    expect(html).toContain('id="quality"');
  });

  it('carries the caution at top and at bottom', () => {
    expect(count(html, DESIGN_VALUE_CAUTION)).toBe(2);
    expect(html.indexOf('caution-top')).toBeLessThan(html.indexOf('id="summary"'));
    expect(html.indexOf('caution-bottom')).toBeGreaterThan(html.indexOf('id="quality"'));
  });

  it('uses a given caution, and falls back to the default when it is blank', async () => {
    const custom = await renderReport({ ...data, caution: 'Check < the > governing code.' });
    expect(count(custom, 'Check &lt; the &gt; governing code.')).toBe(2);
    const blank = await renderReport({ ...data, caution: '   ' });
    expect(count(blank, DESIGN_VALUE_CAUTION)).toBe(2);
  });

  it('puts units on every axis', () => {
    for (const title of ['plastic strain [–]', 'true stress [MPa]', 'tests [count]', 'Rp0.2 [MPa]', 'Rm [MPa]', 'Ag [%]', 'n-value [–]', 'test date [UTC]', 'moving range [MPa]', 'CUSUM [SD]', 'difference of means [MPa]']) {
      expect(html).toContain(title);
    }
  });

  it('escapes hostile text everywhere, in the page and inside the SVG', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<img/i);
    // the words survive only as text: no tag carries an event handler (quotes in text and in
    // attribute values are escaped, so a quoted value after the name means a real attribute)
    expect(html).not.toMatch(/\son\w+\s*=\s*["']/i);
    expect(html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;Sons&#39;');
    // the SVG subtitle of the curves chart carries the group label too (Vega escapes it)
    const firstSvg = html.match(/<svg [\s\S]*?<\/svg>/)![0];
    expect(firstSvg).toContain('&lt;script&gt;');
  });

  it('references nothing outside the file: no scripts, no links, no remote URLs', () => {
    expect(html).not.toMatch(/https?:\/\//i);
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<link\b/i);
    expect(html).not.toMatch(/@import/i);
    // (quotes in text are escaped, so a quoted value means a real attribute)
    expect(html).not.toMatch(/\ssrc\s*=\s*["']/i);
    // url() only to ids inside the page (clip paths)
    for (const m of html.matchAll(/url\(([^)]*)\)/g)) expect(m[1].startsWith('#')).toBe(true);
    for (const m of html.matchAll(/href="([^"]*)"/g)) expect(m[1].startsWith('#')).toBe(true);
  });

  it('gives every element id once, and every internal reference a target', () => {
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    const refs = [...html.matchAll(/(?:url\(#|href="#)([^")]+)/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const r of refs) expect(ids).toContain(r);
  });

  it('formats table numbers: fixed decimals per property, CoV in percent, true minus, dash for missing', async () => {
    const one = sampleReportData({ groups: 1, properties: 2, controlCharts: 0 });
    const rp = one.groups[0].properties[0].stats;
    Object.assign(rp, { mean: 412.345, sd: 10.04, cov: 0.024349, min: -1.25, median: null });
    rp.characteristic = [
      { method: 'tolerance_normal', coverage: 0.95, confidence: 0.75, value: 394.2736, note: null },
      { method: 'en1990_v_unknown', coverage: 0.95, confidence: null, value: -0.04, note: null },
    ];
    rp.warnings = ['Anderson–Darling rejects <all> fits'];
    rp.compliance = { lower: 355, upper: null, n_below: 2, n_above: 0, fraction_outside: 0.05, tail_below: 0.01, tail_above: null, cpk: 1.9087 };
    const page = await renderReport(one);
    // one row in the statistics table, one in the design-value table, one in the characteristic-value table
    const [row, designRow, charRow] = [...page.matchAll(/<tr><td><span class="prop">Rp0\.2<\/span>[\s\S]*?<\/tr>/g)].map((m) => m[0]);
    const cells = [...row.matchAll(/<td[^>]*>([\s\S]*?)<\/td>/g)].map((m) => m[1]);
    // n, mean, sd, CoV, min, p05, median (missing)
    expect(cells.slice(1, 8)).toEqual(['40', '412.3', '10.0', '2.4 %', '−1.3', cells[6], '–']);
    expect(cells[11 - 1]).toBe('normal (0.54)');
    expect(row).toContain('<td class="num">355.0 / –</td>');
    expect(row).toContain('<td class="num">2 / 0</td>');
    expect(row).toContain('<td class="num">5.0 %</td>');
    expect(row).toContain('<td class="num">1.91</td>');
    // the characteristic value of the headline method, one decimal for MPa, marked
    expect(charRow).toContain('<td class="num char headline">394.3</td>');
    // and boxed as the design value with its method
    expect(designRow).toContain('<td class="num char headline design">394.3</td>');
    expect(designRow).toContain('tolerance normal (p 0.95, γ 0.75)');
    // −0.04 to one decimal reads 0.0, not −0.0
    expect(charRow).toContain('<td class="num char">0.0</td>');
    // stats warnings listed under the table, escaped
    expect(page).toContain('<ul class="warnings"><li><span class="prop">Rp0.2</span>: Anderson–Darling rejects &lt;all&gt; fits</li></ul>');
    // method columns carry coverage and confidence in the header
    expect(page).toContain('tolerance normal<span class="th-note">p 0.95, γ 0.75</span>');
  });

  it('cuts long data-quality lists with a count and a pointer to the exports', async () => {
    const many: ReportData = {
      ...data,
      quality: {
        ...data.quality,
        rejections: Array.from({ length: 260 }, (_, i) => ({ file: `m${i}.csv`, line: i + 2, column: 1, code: 'bad_row', message: 'x' })),
      },
      options: { max_rows: 50 },
    };
    const page = await renderReport(many);
    const section = page.slice(page.indexOf('id="quality"'));
    expect(count(section, 'bad_row')).toBe(50);
    expect(section).toContain('Showing 50 of 260 rows; 210 more not shown — the full list is in the CSV/JSON exports.');
  });

  it('renders the same page from the same data', async () => {
    expect(await renderReport(data)).toBe(html);
  });

  it('renders the demo size (12 groups, 100 curves each, 12 properties, 16 control charts) with every chart', async () => {
    // its time is measured by `npm run bench:report`, not asserted here
    const big = sampleReportData({ groups: 12, curvesPerGroup: 100, pointsPerCurve: 50, properties: 12, valuesPerProperty: 80, controlCharts: 16 });
    const page = await renderReport(big);
    expect(count(page, '<svg ')).toBe(12 * 13 + 16 + 1);
    expect(count(page, DESIGN_VALUE_CAUTION)).toBe(2);
  });
});

describe('stage objects shown as text', () => {
  it('lists nested idealizations readably and does not repeat the caution from provenance', async () => {
    const one = sampleReportData({ groups: 1, properties: 1, controlCharts: 0 });
    const page = await renderReport(one);
    // each idealization in the trade's words and units (names as commonly used in practice)
    expect(page).toContain('<h4>Bilinear (linear hardening)</h4>');
    expect(page).toContain(
      '<dl class="kv"><dt>Yield stress</dt><dd>355 MPa</dd><dt>Hardening modulus (vs true plastic strain)</dt><dd>1481 MPa</dd><dt>Tangent modulus (vs total strain)</dt><dd>1470 MPa</dd><dt>RMS deviation from the curve</dt><dd>6.1 MPa</dd></dl>',
    );
    expect(page).toContain('<dt>Modulus of elasticity E</dt><dd>206000 MPa</dd>');
    // no Ramberg–Osgood fit in the fixture: no empty heading for it
    expect(page).not.toContain('Ramberg–Osgood, ε');
    // the 12 multilinear points as a table, not a list of numbers
    const panel = page.slice(page.indexOf('<h4>Multilinear points</h4>'), page.indexOf('</table>', page.indexOf('<h4>Multilinear points</h4>')));
    expect(count(panel, '<tr><td class="num">')).toBe(12);
    expect(panel).toContain('<tr><td class="num">0</td>');
    expect(panel).toContain('<tr><td class="num">0.03667</td>');
    // provenance as labelled lines, settings on one line
    expect(page).toContain('<dt>Settings</dt><dd>grid points 61 · fractile 0.05 · confidence 0.75</dd>');
    expect(page).toContain('<dt>Tests</dt><dd>12</dd>');
    expect(page).not.toContain('<dt>caution</dt>');
    expect(count(page, DESIGN_VALUE_CAUTION)).toBe(2);
    expect(page).toContain('extrapolated by the fitted swift law, not measured');
  });
});

describe('degenerate input', () => {
  it('renders an empty database: no groups, no drift run, no quality findings, caution still twice', async () => {
    const base = sampleReportData({ groups: 1, properties: 1, controlCharts: 0 });
    const page = await renderReport({
      meta: { ...base.meta, counts: { tests: 0, curves: 0, summary_only: 0, rejected: 0, failed: 0, flagged: 0 }, catalog: { source: null, hash: null, grades: [] } },
      groups: [],
      drift: null,
      quality: { rejections: [], failed: [], flagged: [] },
    });
    expect(count(page, '<svg ')).toBe(0);
    expect(page).toContain('The drift stage has not been run.');
    expect(page).toContain('No rejected input.');
    expect(page).toContain('built-in defaults (no limits)');
    expect(count(page, DESIGN_VALUE_CAUTION)).toBe(2);
  });

  it('renders a group without a characteristic curve and a series without the lower panels, skipping unparsable dates', async () => {
    const data = sampleReportData({ groups: 1, properties: 2, controlCharts: 1 });
    const series = data.drift!.series[0];
    const points = [...series.points.slice(0, 20), { date: 'not a date', value: 400, test_id: 'X-1', center: null, lcl: null, ucl: null }];
    const page = await renderReport({
      ...data,
      groups: [{ ...data.groups[0], curves: null, sample_curves: [] }],
      drift: { result: { alerts: [], change_points: [], comparisons: [] }, series: [{ ...series, points, panels: false }] },
    });
    expect(page).toContain('No characteristic curve for this group');
    // 2 histograms + 1 control chart, the latter without the MR, CUSUM and EWMA panels
    expect(count(page, '<svg ')).toBe(3);
    expect(page).not.toContain('EWMA of');
    expect(page).not.toContain('CUSUM [SD]');
    expect(page).toContain('20 tests · 0 alerts');
  });
});
