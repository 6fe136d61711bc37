/**
 * Control chart of one property of one group over test date: the individuals panel (the points,
 * tests or heat means, with the running centre line and Shewhart limits each point was judged
 * against, specification limits, change points as violet rules, alert detections as red rules),
 * and where the series has alerts the moving-range panel (MR and its D4·MR̄ limit), the CUSUM
 * panel (upper sum and lower sum drawn downward, with ±h) and the EWMA panel with its limits
 * (Montgomery, Introduction to Statistical Quality Control; Lucas & Saccucci 1990). Dates are on
 * a UTC time axis whose labels always carry the year. Returns an SVG string.
 *
 * All control charts share one structure per width and panel set (`controlChartTemplate`),
 * compiled once; each chart supplies its data and texts (`controlChartInput`).
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { formatFixed } from './format-number.ts';
import { groupId, groupLabel } from './group-label.ts';
import type { ChartOptions } from './histogram-chart.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { ChangePoint, ControlPoint, ControlSeries, DriftAlert, DriftTestRef } from './types.ts';

export interface ControlChartContext {
  alerts?: readonly DriftAlert[];
  change_points?: readonly ChangePoint[];
}

const STATUS = ['in control', 'outside limits', 'alert'] as const;
type Status = (typeof STATUS)[number];

/** A UTC date axis whose every label shows the year (month and year). */
export const DATE_AXIS = { format: '%b %Y', labelOverlap: true, labelFlush: true } as const;

function toTime(date: string): number | null {
  const t = Date.parse(date);
  return Number.isFinite(t) ? t : null;
}

function refMatches(ref: DriftTestRef, p: ControlPoint): boolean {
  const ids = p.members ?? [p.test_id];
  if (typeof ref === 'string') return ids.includes(ref) || (p.lab !== undefined && ids.includes(`${p.lab}/${ref}`));
  return ids.some((id) => id === ref.test_id || id === `${ref.lab}/${ref.test_id}`);
}

const finite = (x: number | null | undefined): x is number => typeof x === 'number' && Number.isFinite(x);

/** Signals and data of one control chart for `controlChartTemplate`. */
export function controlChartInput(series: ControlSeries, context: ControlChartContext = {}, options: ChartOptions = {}): TemplateInput {
  const id = groupId(series.group);
  const mine = <T extends { group: ControlSeries['group']; property: string }>(rows: readonly T[] | undefined): T[] =>
    (rows ?? []).filter((r) => r.property === series.property && groupId(r.group) === id);
  const alerts = mine(context.alerts);
  const changes = mine(context.change_points);
  const label = propertyLabel(series.property);
  const d = label.decimals;
  const named = new Set<number>();
  series.points.forEach((p, i) => {
    if (alerts.some((a) => a.tests.some((ref) => refMatches(ref, p)))) named.add(i);
  });

  const points: { t: number; value: number; test_id: string; status: Status }[] = [];
  const limits: { t: number; center: number; lcl: number; ucl: number }[] = [];
  const mr: { t: number; mr: number; ucl: number | null }[] = [];
  const cusum: { t: number; high: number; low: number }[] = [];
  const ewma: { t: number; ewma: number; lcl: number; ucl: number; status: 'inside' | 'outside' }[] = [];
  series.points.forEach((p, i) => {
    const t = toTime(p.date);
    if (t === null || !Number.isFinite(p.value)) return;
    const outside = (finite(p.ucl) && p.value > p.ucl) || (finite(p.lcl) && p.value < p.lcl);
    points.push({ t, value: p.value, test_id: p.test_id, status: named.has(i) ? 'alert' : outside ? 'outside limits' : 'in control' });
    if (finite(p.center) && finite(p.lcl) && finite(p.ucl)) limits.push({ t, center: p.center, lcl: p.lcl, ucl: p.ucl });
    if (finite(p.mr)) mr.push({ t, mr: p.mr, ucl: finite(p.mr_ucl) ? p.mr_ucl : null });
    if (finite(p.cusum_high) && finite(p.cusum_low)) cusum.push({ t, high: p.cusum_high, low: -p.cusum_low });
    if (finite(p.ewma) && finite(p.ewma_lcl) && finite(p.ewma_ucl)) ewma.push({ t, ewma: p.ewma, lcl: p.ewma_lcl, ucl: p.ewma_ucl, status: p.ewma > p.ewma_ucl || p.ewma < p.ewma_lcl ? 'outside' : 'inside' });
  });
  const last = limits[limits.length - 1];
  const specs = [
    ...(finite(series.spec_min) ? [{ y: series.spec_min, text: `spec min ${formatFixed(series.spec_min, d)}` }] : []),
    ...(finite(series.spec_max) ? [{ y: series.spec_max, text: `spec max ${formatFixed(series.spec_max, d)}` }] : []),
  ];
  const labels = last
    ? [
        { t: last.t, y: last.ucl, text: `UCL ${formatFixed(last.ucl, d)}` },
        { t: last.t, y: last.lcl, text: `LCL ${formatFixed(last.lcl, d)}` },
      ]
    : [];
  const changeRules = changes
    .map((c) => ({ t: toTime(c.date), text: c.shift === null ? 'change' : `shift ${c.shift >= 0 ? '+' : '−'}${formatFixed(Math.abs(c.shift), d)}` }))
    .filter((c): c is { t: number; text: string } => c.t !== null);
  const detections = alerts
    .map((a) => ({ t: toTime(a.detected_on ?? a.first_date), text: a.rule }))
    .filter((a): a is { t: number; text: string } => a.t !== null)
    .slice(0, 8);
  // y ranges from the points, the specification limits and the last (settled) limits: the first
  // limits of a self-starting chart rest on a few points and would squash everything else
  const domain = (values: number[]): [number, number] => {
    const ok = values.filter(Number.isFinite);
    if (ok.length === 0) return [0, 1];
    const lo = Math.min(...ok);
    const hi = Math.max(...ok);
    const pad = 0.06 * (hi - lo || Math.abs(hi) || 1);
    return [lo - pad, hi + pad];
  };
  const lastEwma = ewma[ewma.length - 1];
  const yDomain = domain([...points.map((p) => p.value), ...specs.map((x) => x.y), ...(last ? [last.lcl, last.ucl] : [])]);
  const ewmaDomain = domain([...ewma.map((e) => e.ewma), ...(lastEwma ? [lastEwma.lcl, lastEwma.ucl] : [])]);
  const mrDomain = domain([0, ...mr.map((r) => r.mr), ...(mr.length && mr[mr.length - 1].ucl !== null ? [mr[mr.length - 1].ucl as number] : [])]);
  const h = series.cusum?.h;
  const ewmaNote = series.ewma ? ` · EWMA λ = ${series.ewma.lambda}, L = ${series.ewma.L}` : '';
  const cusumNote = series.cusum ? ` · CUSUM k = ${formatFixed(series.cusum.k, 2)}, h = ${formatFixed(series.cusum.h, 2)}` : '';
  return {
    signals: {
      title_text: options.title ?? `${label.name} — ${groupLabel(series.group)}`,
      subtitle_text: `${points.length} ${series.point_label ?? 'tests'} · ${alerts.length} alert${alerts.length === 1 ? '' : 's'}${cusumNote}${ewmaNote}`,
      y_title: propertyAxisTitle(series.property),
      mr_title: `moving range [${label.unit}]`,
      cusum_title: 'CUSUM [SD]',
      ewma_title: `EWMA of ${label.name} [${label.unit}]`,
      y_domain: yDomain,
      ewma_domain: ewmaDomain,
      mr_domain: [0, mrDomain[1]],
    },
    data: {
      points,
      limits,
      limit_labels: labels,
      limits_spec: specs,
      changes: changeRules,
      detections,
      mr_rows: mr,
      cusum_rows: cusum,
      cusum_h: finite(h) ? [{ y: h }, { y: -h }] : [],
      ewma_rows: ewma,
    },
  };
}

/** The structure shared by control charts of one width, with or without the lower panels. */
export function controlChartTemplate(width: number, height: number, panels: boolean): TopLevelSpec {
  const x = { field: 't', type: 'temporal' as const, title: 'test date [UTC]', scale: { type: 'utc' as const }, axis: DATE_AXIS };
  const q = (field: string, title?: string, domain = 'y_domain') => ({ field, type: 'quantitative' as const, scale: { zero: false, domain: { expr: domain } }, ...(title ? { title: signalText(title) } : { title: null }) });
  const step = (field: string, color: string, dash: number[], y: ReturnType<typeof q>) => ({
    mark: { type: 'line' as const, color, strokeDash: dash, strokeWidth: 1.1, interpolate: 'step-after' as const, clip: true },
    encoding: { x, y: { ...y, field } },
  });
  const vrules = (name: string, color: string, dash: number[]) => ({
    data: { name },
    layer: [
      { mark: { type: 'rule' as const, color, strokeDash: dash, strokeWidth: 1.1 }, encoding: { x } },
      {
        mark: { type: 'text' as const, align: 'left' as const, baseline: 'top' as const, dx: 3, dy: name === 'changes' ? 2 : 13, color, fontSize: 9 },
        encoding: { x, y: { value: 0 }, text: { field: 'text' } },
      },
    ],
  });
  const yValue = q('value', 'y_title');
  const individuals = {
    width,
    height,
    layer: [
      {
        data: { name: 'limits' },
        layer: [step('center', PALETTE.median, [1, 0], yValue), step('ucl', PALETTE.alert, [5, 3], yValue), step('lcl', PALETTE.alert, [5, 3], yValue)],
      },
      {
        data: { name: 'limit_labels' },
        mark: { type: 'text' as const, align: 'left' as const, dx: 4, color: PALETTE.alert, fontSize: 9.5 },
        encoding: { x, y: { field: 'y', type: 'quantitative' as const }, text: { field: 'text' } },
      },
      {
        data: { name: 'limits_spec' },
        layer: [
          { mark: { type: 'rule' as const, color: PALETTE.spec, strokeDash: [2, 2], strokeWidth: 1.2 }, encoding: { y: { field: 'y', type: 'quantitative' as const } } },
          {
            mark: { type: 'text' as const, align: 'left' as const, baseline: 'bottom' as const, dy: -2, color: PALETTE.spec, fontSize: 9.5 },
            encoding: { y: { field: 'y', type: 'quantitative' as const }, x: { value: 4 }, text: { field: 'text' } },
          },
        ],
      },
      vrules('changes', PALETTE.ewma, [3, 2]),
      vrules('detections', PALETTE.alert, [1, 2]),
      {
        data: { name: 'points' },
        layer: [
          { mark: { type: 'line' as const, color: PALETTE.sample, strokeWidth: 0.9 }, encoding: { x, y: yValue } },
          ...([false, true] as const).map((marked) => ({
            transform: [{ filter: marked ? "datum.status !== 'in control'" : "datum.status === 'in control'" }],
            mark: { type: 'point' as const, filled: true, size: marked ? 46 : 18, opacity: 1 },
            encoding: {
              x,
              y: { field: 'value', type: 'quantitative' as const },
              color: { field: 'status', type: 'nominal' as const, scale: { domain: [...STATUS], range: [PALETTE.median, PALETTE.outside, PALETTE.alert] }, legend: { title: null } },
            },
          })),
        ],
      },
    ],
  };
  const mrPanel = {
    width,
    height: 80,
    data: { name: 'mr_rows' },
    layer: [
      { mark: { type: 'bar' as const, color: PALETTE.bars, width: 1.5, clip: true }, encoding: { x, y: q('mr', 'mr_title', 'mr_domain') } },
      step('ucl', PALETTE.alert, [5, 3], q('ucl', 'mr_title', 'mr_domain')),
    ],
  };
  const cusumY = { field: 'high', type: 'quantitative' as const, title: signalText('cusum_title') };
  const cusumPanel = {
    width,
    height: 90,
    layer: [
      { data: { name: 'cusum_h' }, mark: { type: 'rule' as const, color: PALETTE.alert, strokeDash: [5, 3], strokeWidth: 1.1 }, encoding: { y: { ...cusumY, field: 'y' } } },
      {
        data: { name: 'cusum_rows' },
        layer: [
          { mark: { type: 'line' as const, color: PALETTE.median, strokeWidth: 1.3 }, encoding: { x, y: cusumY } },
          { mark: { type: 'line' as const, color: PALETTE.characteristic, strokeWidth: 1.3 }, encoding: { x, y: { ...cusumY, field: 'low' } } },
        ],
      },
    ],
  };
  const yEwma = q('ewma', 'ewma_title', 'ewma_domain');
  const ewmaPanel = {
    width,
    height: 90,
    data: { name: 'ewma_rows' },
    layer: [
      step('ucl', PALETTE.alert, [5, 3], yEwma),
      step('lcl', PALETTE.alert, [5, 3], yEwma),
      { mark: { type: 'line' as const, color: PALETTE.ewma, strokeWidth: 1.6 }, encoding: { x, y: yEwma } },
      { transform: [{ filter: "datum.status === 'outside'" }], mark: { type: 'point' as const, filled: true, color: PALETTE.alert, size: 30 }, encoding: { x, y: { field: 'ewma', type: 'quantitative' as const } } },
    ],
  };
  return {
    params: [
      ...['title_text', 'subtitle_text', 'y_title', 'mr_title', 'cusum_title', 'ewma_title'].map((name) => ({ name, value: '' })),
      ...['y_domain', 'ewma_domain', 'mr_domain'].map((name) => ({ name, value: [0, 1] })),
    ],
    title: { text: { expr: 'title_text' }, subtitle: signalText('subtitle_text'), subtitleColor: PALETTE.muted, subtitleFontSize: 10 },
    vconcat: panels ? [individuals, mrPanel, cusumPanel, ewmaPanel] : [individuals],
    spacing: 10,
    resolve: { scale: { x: 'shared' } },
  } as TopLevelSpec;
}

const PANEL_DATA = ['mr_rows', 'cusum_rows', 'cusum_h', 'ewma_rows'] as const;

export async function renderControlChart(series: ControlSeries, context: ControlChartContext = {}, options: ChartOptions = {}): Promise<string> {
  const label = `Control chart of ${propertyAxisTitle(series.property)} over test date for ${groupLabel(series.group)}`;
  const input = controlChartInput(series, context, options);
  const width = options.width ?? 470;
  const height = options.height ?? 170;
  const panels = series.panels === true;
  // the chart without the lower panels has no data sets for them
  const data = panels ? input.data : Object.fromEntries(Object.entries(input.data).filter(([k]) => !(PANEL_DATA as readonly string[]).includes(k)));
  return renderTemplateToSvg(`control:${width}x${height}:${panels}`, () => controlChartTemplate(width, height, panels), { signals: input.signals, data }, { idPrefix: options.idPrefix, label });
}
