/**
 * Histogram of one property of one group with the best-fitting distribution's density scaled
 * to expected counts per bin (n · step · pdf), a vertical rule at the headline characteristic
 * value and rules at the specification limits. Returns an SVG string; with no finite value it
 * returns a chart that says so.
 *
 * All histograms share one chart structure (`histogramTemplate`), compiled once; each chart
 * only supplies its data and texts (`histogramInput`).
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { fitDensity } from './fit-density.ts';
import { formatFixed, formatSignificant } from './format-number.ts';
import { histogramBins } from './histogram-bins.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderSpecToSvg, renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { CharacteristicValue, ReportProperty } from './types.ts';

export interface ChartOptions {
  /** Id prefix for SVG elements, unique within one page. */
  idPrefix?: string;
  /** Chart title; default from the data. */
  title?: string;
  width?: number;
  height?: number;
}

const FIT_POINTS = 120;
const KINDS = { domain: ['characteristic', 'spec'], range: [PALETTE.characteristic, PALETTE.spec] };

/**
 * The characteristic value marked in the histogram: the method named by `headline_method`, else
 * the stats stage's headline, else the first method with a value.
 */
export function headlineCharacteristic(property: ReportProperty): CharacteristicValue | null {
  const usable = (c: CharacteristicValue | null | undefined): c is CharacteristicValue => !!c && c.value !== null && Number.isFinite(c.value);
  const withValue = property.stats.characteristic.filter(usable);
  if (property.headline_method !== undefined) {
    const named = withValue.find((c) => c.method === property.headline_method);
    if (named) return named;
  }
  if (usable(property.stats.headline)) return property.stats.headline;
  // a stats stage that states its headline and has none (too few values): no value is put forward
  if (property.stats.headline_rule !== undefined) return null;
  return withValue[0] ?? null;
}

interface RuleRow {
  x: number;
  kind: 'characteristic' | 'spec';
  side: 'characteristic' | 'min' | 'max';
  text: string;
  anchor: 'left' | 'right';
  row: 0 | 1;
}

/** The chart structure shared by all histograms; data sets `bins`, `fit`, `rules`. */
export function histogramTemplate(width: number, height: number): TopLevelSpec {
  const x = {
    type: 'quantitative' as const,
    title: signalText('x_title'),
    scale: { zero: false, nice: false, domain: { expr: '[x_lo, x_hi]' } },
  };
  const yScale = { domain: { expr: '[0, y_hi]' }, nice: false };
  const spec: TopLevelSpec = {
    width,
    height,
    params: [
      { name: 'x_lo', value: 0 },
      { name: 'x_hi', value: 1 },
      { name: 'y_hi', value: 1 },
      { name: 'x_title', value: '' },
      { name: 'title_text', value: '' },
      { name: 'subtitle_text', value: '' },
    ],
    title: { text: { expr: 'title_text' }, subtitle: signalText('subtitle_text'), subtitleColor: PALETTE.muted, subtitleFontSize: 10 },
    layer: [
      {
        data: { name: 'bins' },
        mark: { type: 'rect', color: PALETTE.bars, stroke: '#ffffff', strokeWidth: 0.6 },
        encoding: {
          x: { ...x, field: 'start' },
          x2: { field: 'stop' },
          y: { field: 'count', type: 'quantitative', title: 'tests [count]', scale: yScale, axis: { tickMinStep: 1 } },
        },
      },
      {
        data: { name: 'fit' },
        mark: { type: 'line', color: PALETTE.fit, strokeWidth: 1.8, interpolate: 'monotone' },
        encoding: { x: { ...x, field: 'x' }, y: { field: 'y', type: 'quantitative', scale: yScale } },
      },
      {
        data: { name: 'rules' },
        layer: [
          {
            mark: { type: 'rule', strokeWidth: 1.6 },
            encoding: {
              x: { ...x, field: 'x' },
              color: { field: 'kind', type: 'nominal', scale: KINDS, legend: null },
              strokeDash: { field: 'kind', type: 'nominal', scale: { domain: KINDS.domain, range: [[1, 0], [4, 3]] }, legend: null },
            },
          },
          // characteristic label on the top row, limits on the second; each label points away
          // from the other rules, and inwards near the plot edges
          ...(['left', 'right'] as const).flatMap((anchor) =>
            ([0, 1] as const).map((row) => ({
              transform: [{ filter: `datum.anchor === '${anchor}' && datum.row === ${row}` }],
              mark: {
                type: 'text' as const,
                baseline: 'top' as const,
                align: anchor,
                dx: anchor === 'right' ? -3 : 3,
                dy: row === 0 ? 1 : 13,
                fontSize: 9.5,
                fontWeight: 600 as const,
              },
              encoding: {
                x: { ...x, field: 'x' },
                y: { value: 0 },
                text: { field: 'text' },
                color: { field: 'kind', type: 'nominal' as const, scale: KINDS, legend: null },
              },
            })),
          ),
        ],
      },
    ],
  };
  return spec;
}

/** Signals and data of one histogram, or null where there is no finite value to draw. */
export function histogramInput(property: ReportProperty, options: ChartOptions = {}): TemplateInput | null {
  const { stats } = property;
  const label = propertyLabel(stats.property);
  const histogram = histogramBins(property.values);
  if (histogram.n === 0) return null;

  const headline = headlineCharacteristic(property);
  const rules: RuleRow[] = [];
  const push = (x: number, kind: RuleRow['kind'], side: RuleRow['side'], text: string) => rules.push({ x, kind, side, text, anchor: 'left', row: 0 });
  if (headline && headline.value !== null) push(headline.value, 'characteristic', 'characteristic', `char. ${formatFixed(headline.value, label.decimals)}`);
  const lower = stats.compliance?.lower ?? null;
  const upper = stats.compliance?.upper ?? null;
  if (lower !== null && Number.isFinite(lower)) push(lower, 'spec', 'min', `min ${formatFixed(lower, label.decimals)}`);
  if (upper !== null && Number.isFinite(upper)) push(upper, 'spec', 'max', `max ${formatFixed(upper, label.decimals)}`);

  let lo = histogram.bins[0].start;
  let hi = histogram.bins[histogram.bins.length - 1].stop;
  for (const r of rules) {
    lo = Math.min(lo, r.x);
    hi = Math.max(hi, r.x);
  }
  for (const r of rules) {
    const at = (r.x - lo) / (hi - lo || 1);
    r.anchor = at < 0.3 ? 'left' : at > 0.7 ? 'right' : r.side === 'min' ? 'right' : 'left';
    r.row = r.side === 'characteristic' ? 0 : 1;
  }

  const best = stats.fits.find((f) => f.model === stats.best_fit) ?? null;
  const density = best ? fitDensity(best) : null;
  const fit: { x: number; y: number }[] = [];
  if (density) {
    for (let i = 0; i <= FIT_POINTS; i++) {
      const x = lo + ((hi - lo) * i) / FIT_POINTS;
      const y = histogram.n * histogram.step * density(x);
      if (Number.isFinite(y)) fit.push({ x, y });
    }
  }
  let yMax = 0;
  for (const b of histogram.bins) yMax = Math.max(yMax, b.count);
  for (const p of fit) yMax = Math.max(yMax, p.y);

  const subtitle = best
    ? `n = ${histogram.n} · fit: ${best.model} (AD ${formatSignificant(best.ad)}, p ${formatSignificant(best.p)})`
    : `n = ${histogram.n} · no fitted model`;
  return {
    signals: {
      x_lo: lo,
      x_hi: hi,
      // room above the tallest bar for the rule labels
      y_hi: Math.ceil(yMax * 1.28),
      x_title: propertyAxisTitle(stats.property),
      title_text: options.title ?? label.name,
      subtitle_text: subtitle,
    },
    data: { bins: histogram.bins, fit, rules },
  };
}

function emptyHistogramSpec(property: ReportProperty, options: ChartOptions): TopLevelSpec {
  const xTitle = propertyAxisTitle(property.stats.property);
  return {
    width: options.width ?? 250,
    height: options.height ?? 140,
    title: { text: options.title ?? propertyLabel(property.stats.property).name, subtitle: 'n = 0' },
    data: { values: [{ x: 0, y: 0, text: 'no values to draw' }] },
    mark: { type: 'text', color: PALETTE.muted, fontSize: 12 },
    encoding: {
      x: { field: 'x', type: 'quantitative', title: xTitle, axis: { labels: false, ticks: false } },
      y: { field: 'y', type: 'quantitative', title: 'tests [count]', axis: { labels: false, ticks: false } },
      text: { field: 'text' },
    },
  };
}

export async function renderHistogram(property: ReportProperty, options: ChartOptions = {}): Promise<string> {
  const label = `Histogram of ${propertyAxisTitle(property.stats.property)} with fitted model and characteristic value`;
  const input = histogramInput(property, options);
  if (input === null) return renderSpecToSvg(emptyHistogramSpec(property, options), { idPrefix: options.idPrefix, label });
  const width = options.width ?? 250;
  const height = options.height ?? 140;
  return renderTemplateToSvg(`histogram:${width}x${height}`, () => histogramTemplate(width, height), input, { idPrefix: options.idPrefix, label });
}
