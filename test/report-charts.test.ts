/**
 * Charts of the report: the fitted densities against SciPy, the histogram's expected-count
 * curve, binning, and what the SVG of each chart shows (separate test curves, dashed
 * extrapolation, validity limit, alert points, axis titles with units).
 */
import { describe, expect, it } from 'vitest';
import {
  fitDensity,
  headlineCharacteristic,
  freedmanDiaconisCount,
  histogramBins,
  MAX_BINS,
  MIN_BINS,
  histogramInput,
  renderControlChart,
  renderComparisonChart,
  renderCurvesChart,
  renderHistogram,
  type DistributionFit,
  type ReportProperty,
} from '@fractile/report';
import { sampleReportData } from '../packages/report/src/testing/sample-report-data.ts';
import { runPython } from './support/scipy.ts';

const xs = [0.5, 1, 2, 5, 10, 300, 355, 392, 410, 455];

describe('fitted densities', () => {
  it('agree with scipy.stats pdf for normal, lognormal and weibull in the stats-stage parameters', () => {
    // Reference: SciPy 1.10 scipy.stats.norm / lognorm(s=sigma, scale=exp(mu)) / weibull_min(c=shape, scale)
    const fits: DistributionFit[] = [
      { model: 'normal', params: { mean: 392, sd: 14 }, ad: null, p: null },
      { model: 'normal', params: { mu: 405, sigma: 21 }, ad: null, p: null },
      { model: 'lognormal', params: { mu: Math.log(392), sigma: 0.04 }, ad: null, p: null },
      { model: 'weibull', params: { shape: 28, scale: 400 }, ad: null, p: null },
      { model: 'lognormal', params: { mu: 1.1, sigma: 0.6 }, ad: null, p: null },
      { model: 'weibull', params: { shape: 1.7, scale: 4 }, ad: null, p: null },
    ];
    const expected = runPython<number[][]>(
      `
from scipy import stats
import math
out = []
for f in data['fits']:
    p = f['params']
    if f['model'] == 'normal': d = stats.norm(loc=p.get('mean', p.get('mu')), scale=p.get('sd', p.get('sigma')))
    elif f['model'] == 'lognormal': d = stats.lognorm(s=p['sigma'], scale=math.exp(p['mu']))
    else: d = stats.weibull_min(c=p['shape'], scale=p['scale'])
    out.append([float(d.pdf(x)) for x in data['xs']])
print(json.dumps(out))
`,
      { fits, xs },
    );
    fits.forEach((fit, i) => {
      const density = fitDensity(fit);
      expect(density).not.toBeNull();
      xs.forEach((x, j) => {
        const want = expected[i][j];
        const got = density!(x);
        expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-12 + 1e-9 * Math.abs(want));
      });
    });
  });

  it('refuses unknown models and impossible parameters instead of drawing nonsense', () => {
    expect(fitDensity({ model: 'gumbel', params: { loc: 1, scale: 1 }, ad: null, p: null })).toBeNull();
    expect(fitDensity({ model: 'normal', params: { mean: 1, sd: 0 }, ad: null, p: null })).toBeNull();
    expect(fitDensity({ model: 'weibull', params: { shape: 2 }, ad: null, p: null })).toBeNull();
    expect(fitDensity({ model: 'lognormal', params: { mu: Number.NaN, sigma: 1 }, ad: null, p: null })).toBeNull();
  });
});

describe('histogram bins', () => {
  // a deterministic sample generator (LCG, Numerical Recipes constants) so that the cases are fixed
  const lcg = (seed: number) => () => {
    seed = (1664525 * seed + 1013904223) >>> 0;
    return (seed + 0.5) / 2 ** 32;
  };
  const normalish = (n: number, mean: number, sd: number, seed: number) => {
    const u = lcg(seed);
    return Array.from({ length: n }, () => Math.round(100 * (mean + sd * Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()))) / 100);
  };
  const cases: [string, number[]][] = [
    ['400 strengths', normalish(400, 392, 14, 7)],
    ['1000 strengths', normalish(1000, 520, 22, 3)],
    ['60 elongations', normalish(60, 24, 2.5, 11)],
    ['30 ratios', normalish(30, 0.78, 0.03, 5)],
  ];

  it.each(cases)('%s: edges and counts of numpy.histogram(bins="fd") (Freedman & Diaconis 1981)', (_name, values) => {
    // Reference: NumPy numpy.histogram / histogram_bin_edges with bins='fd': h = 2·IQR·n^(-1/3)
    const ref = runPython<{ edges: number[]; counts: number[] }>(
      "import numpy as np\nx = np.array(data)\nc, e = np.histogram(x, bins='fd')\nprint(json.dumps({'edges': [float(v) for v in np.histogram_bin_edges(x, bins='fd')], 'counts': [int(v) for v in c]}))",
      values,
    );
    expect(ref.counts.length).toBeGreaterThanOrEqual(MIN_BINS);
    expect(ref.counts.length).toBeLessThanOrEqual(MAX_BINS);
    expect(freedmanDiaconisCount(values)).toBe(ref.counts.length);
    const h = histogramBins(values);
    expect(h.bins.map((b) => b.count)).toEqual(ref.counts);
    const edges = [...h.bins.map((b) => b.start), h.bins.at(-1)!.stop];
    edges.forEach((e, i) => expect(e).toBeCloseTo(ref.edges[i], 9));
    expect(h.step).toBeCloseTo(ref.edges[1] - ref.edges[0], 9);
  });

  it('gives hundreds of tests more than the 7 bins of Sturges: n = 400 → numpy fd count', () => {
    const values = cases[0][1];
    // Sturges: ⌈log2 400⌉ + 1 = 10 over the range; FD for a normal sample grows as n^(1/3)
    expect(histogramBins(values).bins.length).toBeGreaterThan(10);
  });

  it('holds the bin count between the floor and the cap where the rule gives fewer or more (numpy count clamped)', () => {
    // 8 values: FD gives few bins; one far outlier among 200 tight values gives hundreds
    const few = [351, 352.5, 360, 360, 371.2, 389.9, 390, 402, Number.NaN, Infinity];
    const outlier = [...normalish(199, 400, 2, 9), 5000];
    const ref = runPython<number[]>("import numpy as np\nprint(json.dumps([len(np.histogram_bin_edges(np.array(v), bins='fd')) - 1 for v in data]))", [few.filter(Number.isFinite), outlier]);
    expect(ref[0]).toBeLessThan(MIN_BINS);
    expect(ref[1]).toBeGreaterThan(MAX_BINS);
    const h = histogramBins(few);
    expect(h.n).toBe(8);
    expect(h.bins.length).toBe(MIN_BINS);
    expect(h.bins.reduce((s, b) => s + b.count, 0)).toBe(8);
    expect(h.bins[0].start).toBe(351);
    expect(h.bins.at(-1)!.stop).toBe(402);
    const o = histogramBins(outlier);
    expect(o.bins.length).toBe(MAX_BINS);
    expect(o.bins.reduce((s, b) => s + b.count, 0)).toBe(200);
    expect(o.bins.at(-1)!.count).toBe(1);
  });

  it('handle no values, all-equal values, and IQR = 0 with a spread (numpy gives 1 bin; the floor applies)', () => {
    expect(histogramBins([]).bins).toEqual([]);
    expect(histogramBins([5, 5, 5]).bins).toEqual([{ start: 4.5, stop: 5.5, count: 3 }]);
    const ties = [...Array(20).fill(400), 380, 430];
    expect(freedmanDiaconisCount(ties)).toBe(runPython<number>("import numpy as np\nprint(len(np.histogram_bin_edges(np.array(data), bins='fd')) - 1)", ties));
    expect(histogramBins(ties).bins.map((b) => b.count)).toEqual([1, 0, 20, 0, 1]);
  });
});

function property(values: number[], mean: number, sd: number): ReportProperty {
  return {
    values,
    headline_method: 'tolerance_normal',
    stats: {
      group: { grade: 'G355' },
      property: 'rp02_mpa',
      n: values.length,
      mean,
      sd,
      cov: sd / mean,
      min: Math.min(...values),
      max: Math.max(...values),
      median: mean,
      percentiles: { p05: null, p50: null, p95: null },
      fits: [{ model: 'normal', params: { mean, sd }, ad: 0.2, p: 0.8 }],
      best_fit: 'normal',
      characteristic: [
        { method: 'distribution_free', coverage: 0.95, confidence: 0.95, value: null, note: 'n too small' },
        { method: 'tolerance_normal', coverage: 0.95, confidence: 0.75, value: 363.2, note: null },
      ],
      compliance: { lower: 355, upper: null, n_below: 0, n_above: 0, fraction_outside: 0, tail_below: 0.003, tail_above: null, cpk: 0.88 },
      warnings: [],
    },
  };
}

describe('histogram chart', () => {
  const values = Array.from({ length: 50 }, (_, i) => 392 + 14 * Math.sqrt(2) * inverseErf((2 * (i + 0.5)) / 50 - 1));

  it('scales the fitted density to expected counts per bin: n · step · pdf (checked with SciPy)', () => {
    const p = property(values, 392, 14);
    const input = histogramInput(p)!;
    const fit = input.data.fit as { x: number; y: number }[];
    const bins = histogramBins(values);
    // Reference: SciPy 1.10 scipy.stats.norm.pdf
    const pdf = runPython<number[]>(
      'from scipy import stats\nprint(json.dumps([float(stats.norm.pdf(x, 392, 14)) for x in data]))',
      fit.map((f) => f.x),
    );
    fit.forEach((f, i) => expect(f.y).toBeCloseTo(50 * bins.step * pdf[i], 9));
    // the rules: the named headline method (not the first, which has no value) and the spec minimum
    const rules = input.data.rules as { x: number; kind: string }[];
    expect(rules).toEqual(expect.arrayContaining([expect.objectContaining({ x: 363.2, kind: 'characteristic' }), expect.objectContaining({ x: 355, kind: 'spec' })]));
    expect(input.signals.x_lo).toBeLessThanOrEqual(355);
  });

  it('draws bars, the fitted curve, both rules with their labels and axis titles with units', async () => {
    const svg = await renderHistogram(property(values, 392, 14), { idPrefix: 'h1' });
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('Rp0.2 [MPa]');
    expect(svg).toContain('tests [count]');
    expect(svg).toContain('char. 363.2');
    expect(svg).toContain('min 355.0');
    expect(svg).toContain('n = 50 · fit: normal');
    const bars = histogramBins(values).bins.filter((b) => b.count > 0).length;
    expect((svg.match(/class="mark-rect[^"]*"/g) ?? []).length).toBe(1);
    expect(svg.match(/<g class="mark-rect[\s\S]*?<\/g>/)![0].match(/<path /g)!.length).toBe(bars);
  });

  it('marks the stats stage headline when no method is named, else the named one', () => {
    const p = property(values, 392, 14);
    const headline = { method: 'tolerance_lognormal', coverage: 0.95, confidence: 0.75, value: 366.1, note: null };
    const unnamed: ReportProperty = { ...p, headline_method: undefined, stats: { ...p.stats, headline } };
    expect(headlineCharacteristic(unnamed)).toEqual(headline);
    expect(headlineCharacteristic({ ...unnamed, headline_method: 'tolerance_normal' })!.value).toBe(363.2);
    // neither: the first method with a value (the first entry has none)
    expect(headlineCharacteristic({ ...p, headline_method: undefined })!.method).toBe('tolerance_normal');
  });

  it('says so when there is nothing to draw', async () => {
    const svg = await renderHistogram(property([], 0, 1));
    expect(svg).toContain('no values to draw');
  });
});

describe('curves chart', () => {
  const data = sampleReportData({ groups: 1, curvesPerGroup: 7, pointsPerCurve: 20 });
  const group = data.groups[0];

  it('draws each test curve as its own stroke in one path, median and characteristic bold, extrapolation dashed', async () => {
    const svg = await renderCurvesChart(group.curves!, group.sample_curves, { idPrefix: 'cv' });
    expect(svg).toContain('plastic strain [–]');
    expect(svg).toContain('true stress [MPa]');
    expect(svg).toContain('validity limit 0.140');
    expect(svg).toContain('n = 7 tests · 7 test curves shown');
    const lines = marks(svg, 'line');
    expect(lines.length).toBe(5);
    // all sample curves in one light path, one move-to per curve
    expect(lines[0]).toContain('stroke="#93a1b3"');
    expect(/ d="([^"]+)"/.exec(lines[0])![1].match(/M/g)!.length).toBe(7);
    // median and characteristic, each measured (solid) and extrapolated (dashed)
    const bold = lines.slice(1);
    expect(bold.filter((p) => p.includes('stroke="#1f4e79"')).length).toBe(2);
    expect(bold.filter((p) => p.includes('stroke="#b4441f"')).length).toBe(2);
    expect(bold.filter((p) => p.includes('stroke-dasharray="6,4"')).length).toBe(2);
    expect(bold.every((p) => p.includes('stroke-width="2.4"'))).toBe(true);
  });
});

describe('control chart', () => {
  const data = sampleReportData({ groups: 1, controlCharts: 1 });
  const series = data.drift!.series[0];
  const alerts = data.drift!.result.alerts;

  it('marks the points named by alerts and those outside their limits, labels the limits and draws MR, CUSUM and EWMA', async () => {
    expect(alerts.length).toBe(1);
    const named = new Set(alerts[0].tests.map((t) => (typeof t === 'string' ? t : t.test_id)));
    const outside = series.points.filter((p) => !named.has(p.test_id) && ((p.ucl !== null && p.value > p.ucl) || (p.lcl !== null && p.value < p.lcl))).length;
    const svg = await renderControlChart(series, data.drift!.result, { idPrefix: 'cc' });
    // data points sit in "role-mark" groups; legend symbols in "role-legend-symbol" ones
    const count = (colour: string) => marks(svg, 'symbol').filter((p) => p.includes(`fill="${colour}"`)).length;
    const ewmaOutside = series.points.filter((p) => p.ewma! > p.ewma_ucl! || p.ewma! < p.ewma_lcl!).length;
    const alerted = series.points.filter((p) => named.has(p.test_id)).length;
    expect(alerted).toBe(named.size);
    // red: alert points in the individuals panel and EWMA points beyond their limits
    expect(count('#c0262d')).toBe(alerted + ewmaOutside);
    expect(count('#e08a1e')).toBe(outside);
    const last = series.points[series.points.length - 1];
    expect(svg).toContain(`UCL ${last.ucl!.toFixed(1)}`);
    expect(svg).toContain(`LCL ${last.lcl!.toFixed(1)}`);
    expect(svg).toContain('spec min 355.0');
    expect(svg).toContain('test date [UTC]');
    expect(svg).toContain('Rp0.2 [MPa]');
    expect(svg).toContain('moving range [MPa]');
    expect(svg).toContain('CUSUM [SD]');
    expect(svg).toContain('EWMA of Rp0.2 [MPa]');
    expect(svg).toContain('shift −21.6');
    expect(svg).toContain('cusum-low'); // the alert's detection rule
  });

  it('shows the year on every date label of every panel', async () => {
    const svg = await renderControlChart(series, data.drift!.result, { idPrefix: 'cy' });
    const texts = [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
    const dates = texts.filter((t) => /^(Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec)\b/.test(t));
    expect(dates.length).toBeGreaterThanOrEqual(8); // four panels, a few labels each
    for (const t of dates) expect(t).toMatch(/^[A-Z][a-z]{2} 20\d\d$/);
    // nothing that looks like a bare year or a bare month is left on an axis
    expect(texts.filter((t) => /^(20\d\d|January|February)$/.test(t))).toEqual([]);
  });
});

describe('supplier comparison chart', () => {
  const data = sampleReportData({ groups: 1, controlCharts: 1 });
  const c = data.drift!.result.comparisons[0];

  it('draws a box per supplier and a Games–Howell interval per pair, red where it excludes zero', async () => {
    const svg = await renderComparisonChart(c, 'gh');
    // labels on two lines: supplier and count; first and second supplier of a pair
    expect(svg).toContain('<tspan>Northmill</tspan><tspan x="0" dy="12">n = 120</tspan>');
    expect(svg).toContain('<tspan>Harbor Rolling</tspan><tspan x="0" dy="12">− Eastfield</tspan>');
    expect(svg).toContain('difference of means [MPa]');
    expect(svg).toContain('Games–Howell 95 % simultaneous intervals');
    // per supplier a box and a median tick (both drawn as rectangles)
    expect(marks(svg, 'rect').length).toBe(6);
    // interval points: two exclude zero (red), one does not
    const dots = marks(svg, 'symbol');
    expect(dots.filter((p) => p.includes('fill="#c0262d"')).length).toBe(2);
    expect(dots.filter((p) => p.includes('fill="#1f4e79"')).length).toBe(1);
  });
});

/** The <path> elements of the data marks of one type (Vega's SVG: <g class="mark-TYPE role-mark …">). */
function marks(svg: string, type: string): string[] {
  const groups = [...svg.matchAll(new RegExp(`<g class="mark-${type} role-mark[^"]*"[^>]*>((?:<path [^>]*/>)*)</g>`, 'g'))];
  return groups.flatMap((g) => g[1].match(/<path [^>]*\/>/g) ?? []);
}

/** Inverse error function by Newton steps on erf (for evenly spread normal scores). */
function inverseErf(y: number): number {
  let x = 0;
  for (let i = 0; i < 60; i++) {
    const err = erf(x) - y;
    x -= err / ((2 / Math.sqrt(Math.PI)) * Math.exp(-x * x));
  }
  return x;
}

function erf(x: number): number {
  // series for |x| < 3, enough for scores of 50 points
  let sum = 0;
  let term = x;
  for (let n = 0; n < 80; n++) {
    sum += term / (2 * n + 1);
    term *= (-x * x) / (n + 1);
  }
  return (2 / Math.sqrt(Math.PI)) * sum;
}
