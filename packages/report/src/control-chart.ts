/**
 * Control chart of one property of one group over test date: the individuals chart (values,
 * centre line, upper and lower control limits, specification limits) with points outside the
 * limits and the points named by drift alerts marked, change points as vertical rules, and
 * below it, where given, the EWMA panel with its limits (Montgomery, Introduction to
 * Statistical Quality Control; Lucas & Saccucci 1990). Dates are drawn on a UTC time axis.
 * Returns an SVG string.
 *
 * All control charts share one structure per width and EWMA presence (`controlChartTemplate`),
 * compiled once; each chart supplies its data and texts (`controlChartInput`).
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { formatFixed } from './format-number.ts';
import { groupId, groupLabel } from './group-label.ts';
import type { ChartOptions } from './histogram-chart.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { ChangePoint, ControlSeries, DriftAlert, DriftTestRef } from './types.ts';

export interface ControlChartContext {
  alerts?: readonly DriftAlert[];
  change_points?: readonly ChangePoint[];
}

const STATUS = ['in control', 'outside limits', 'alert'] as const;
type Status = (typeof STATUS)[number];
const LIMIT_KINDS = ['center', 'control', 'spec'] as const;
const LIMIT_STYLE = {
  center: { color: PALETTE.median, dash: [1, 0] },
  control: { color: PALETTE.alert, dash: [5, 3] },
  spec: { color: PALETTE.spec, dash: [2, 2] },
} as const;

function toTime(date: string): number | null {
  const t = Date.parse(date);
  return Number.isFinite(t) ? t : null;
}

function refMatches(ref: DriftTestRef, testId: string, lab: string | undefined): boolean {
  if (typeof ref === 'string') return ref === testId;
  return ref.test_id === testId && (ref.lab === undefined || lab === undefined || ref.lab === lab);
}

function limitAt(limit: number | readonly number[], i: number): number {
  return typeof limit === 'number' ? limit : (limit[i] ?? Number.NaN);
}

/** Signals and data of one control chart for `controlChartTemplate`. */
export function controlChartInput(series: ControlSeries, context: ControlChartContext = {}, options: ChartOptions = {}): TemplateInput {
  const id = groupId(series.group);
  const mine = <T extends { group: ControlSeries['group']; property: string }>(rows: readonly T[] | undefined): T[] =>
    (rows ?? []).filter((r) => r.property === series.property && groupId(r.group) === id);
  const alerts = mine(context.alerts);
  const changes = mine(context.change_points);
  const label = propertyLabel(series.property);
  const d = label.decimals;

  const points: { t: number; value: number; test_id: string; status: Status }[] = [];
  series.points.forEach((p) => {
    const t = toTime(p.date);
    if (t === null || !Number.isFinite(p.value)) return;
    const alerted = alerts.some((a) => a.tests.some((ref) => refMatches(ref, p.test_id, p.lab)));
    const outside = p.value > series.ucl || p.value < series.lcl;
    points.push({ t, value: p.value, test_id: p.test_id, status: alerted ? 'alert' : outside ? 'outside limits' : 'in control' });
  });

  const limits: Record<(typeof LIMIT_KINDS)[number], { y: number; text: string }[]> = {
    center: [{ y: series.center, text: `CL ${formatFixed(series.center, d)}` }],
    control: [
      { y: series.ucl, text: `UCL ${formatFixed(series.ucl, d)}` },
      { y: series.lcl, text: `LCL ${formatFixed(series.lcl, d)}` },
    ],
    spec: [
      ...(series.spec_min != null ? [{ y: series.spec_min, text: `spec min ${formatFixed(series.spec_min, d)}` }] : []),
      ...(series.spec_max != null ? [{ y: series.spec_max, text: `spec max ${formatFixed(series.spec_max, d)}` }] : []),
    ],
  };
  const changeRules = changes
    .map((c) => ({ t: toTime(c.date), text: c.shift === null ? 'change' : `shift ${c.shift >= 0 ? '+' : ''}${formatFixed(c.shift, d)}` }))
    .filter((c): c is { t: number; text: string } => c.t !== null);

  const ewma = series.ewma;
  const ewmaRows: { t: number; ewma: number; ucl: number; lcl: number; status: 'inside' | 'outside' }[] = [];
  if (ewma) {
    series.points.forEach((p, i) => {
      const t = toTime(p.date);
      const value = ewma.values[i];
      if (t === null || value === undefined || !Number.isFinite(value)) return;
      const ucl = limitAt(ewma.ucl, i);
      const lcl = limitAt(ewma.lcl, i);
      ewmaRows.push({ t, ewma: value, ucl, lcl, status: value > ucl || value < lcl ? 'outside' : 'inside' });
    });
  }
  const ewmaNote = ewma && ewma.lambda !== undefined ? ` · EWMA λ = ${ewma.lambda}${ewma.L !== undefined ? `, L = ${ewma.L}` : ''}` : '';
  const finite = (rows: { y: number; text: string }[]) => rows.filter((r) => Number.isFinite(r.y));
  return {
    signals: {
      title_text: options.title ?? `${label.name} — ${groupLabel(series.group)}`,
      subtitle_text: `${points.length} ${series.point_label ?? 'tests'} · ${alerts.length} alert${alerts.length === 1 ? '' : 's'}${ewmaNote}`,
      y_title: propertyAxisTitle(series.property),
      ewma_title: `EWMA of ${label.name} [${label.unit}]`,
    },
    data: {
      points,
      changes: changeRules,
      limits_center: finite(limits.center),
      limits_control: finite(limits.control),
      limits_spec: finite(limits.spec),
      ewma_rows: ewmaRows,
      ewma_center: ewma && Number.isFinite(ewma.center) ? [{ y: ewma.center }] : [],
    },
  };
}

/** The structure shared by control charts of one width, with or without the EWMA panel. */
export function controlChartTemplate(width: number, height: number, withEwma: boolean): TopLevelSpec {
  const x = { field: 't', type: 'temporal' as const, title: 'test date [UTC]', scale: { type: 'utc' as const } };
  const limitLayers = LIMIT_KINDS.map((kind) => {
    const style = LIMIT_STYLE[kind];
    // control limits are labelled at the right end, specification limits inside at the left,
    // so a limit and a specification at nearly the same value stay readable
    const text =
      kind === 'spec'
        ? { type: 'text' as const, align: 'left' as const, baseline: 'bottom' as const, dy: -2, color: style.color, fontSize: 9.5 }
        : { type: 'text' as const, align: 'left' as const, dx: 4, color: style.color, fontSize: 9.5 };
    return {
      data: { name: `limits_${kind}` },
      layer: [
        {
          mark: { type: 'rule' as const, color: style.color, strokeDash: [...style.dash], strokeWidth: 1.2 },
          encoding: { y: { field: 'y', type: 'quantitative' as const } },
        },
        {
          mark: text,
          encoding: { y: { field: 'y', type: 'quantitative' as const }, x: { value: kind === 'spec' ? 4 : width }, text: { field: 'text' } },
        },
      ],
    };
  });

  const individuals = {
    width,
    height,
    layer: [
      ...limitLayers,
      {
        data: { name: 'changes' },
        layer: [
          { mark: { type: 'rule' as const, color: PALETTE.ewma, strokeDash: [3, 2], strokeWidth: 1.2 }, encoding: { x } },
          {
            mark: { type: 'text' as const, align: 'left' as const, baseline: 'top' as const, dx: 3, dy: 2, color: PALETTE.ewma, fontSize: 9.5 },
            encoding: { x, y: { value: 0 }, text: { field: 'text' } },
          },
        ],
      },
      {
        data: { name: 'points' },
        layer: [
          {
            mark: { type: 'line' as const, color: PALETTE.sample, strokeWidth: 0.9 },
            encoding: {
              x,
              y: { field: 'value', type: 'quantitative' as const, title: signalText('y_title'), scale: { zero: false } },
            },
          },
          ...([false, true] as const).map((marked) => ({
            transform: [{ filter: marked ? "datum.status !== 'in control'" : "datum.status === 'in control'" }],
            mark: { type: 'point' as const, filled: true, size: marked ? 46 : 18, opacity: 1 },
            encoding: {
              x,
              y: { field: 'value', type: 'quantitative' as const },
              color: {
                field: 'status',
                type: 'nominal' as const,
                scale: { domain: [...STATUS], range: [PALETTE.median, PALETTE.outside, PALETTE.alert] },
                legend: { title: null },
              },
            },
          })),
        ],
      },
    ],
  };

  const y = (field: string) => ({ field, type: 'quantitative' as const, title: signalText('ewma_title'), scale: { zero: false } });
  const limitLine = (field: string) => ({
    mark: { type: 'line' as const, color: PALETTE.alert, strokeDash: [5, 3], strokeWidth: 1.1, interpolate: 'step-after' as const },
    encoding: { x, y: y(field) },
  });
  const ewmaPanel = {
    width,
    height: 100,
    data: { name: 'ewma_rows' },
    layer: [
      limitLine('ucl'),
      limitLine('lcl'),
      {
        data: { name: 'ewma_center' },
        mark: { type: 'rule' as const, color: PALETTE.median, strokeWidth: 1 },
        encoding: { y: { field: 'y', type: 'quantitative' as const } },
      },
      { mark: { type: 'line' as const, color: PALETTE.ewma, strokeWidth: 1.6 }, encoding: { x, y: y('ewma') } },
      {
        transform: [{ filter: "datum.status === 'outside'" }],
        mark: { type: 'point' as const, filled: true, color: PALETTE.alert, size: 36 },
        encoding: { x, y: y('ewma') },
      },
    ],
  };

  return {
    params: [
      { name: 'title_text', value: '' },
      { name: 'subtitle_text', value: '' },
      { name: 'y_title', value: '' },
      { name: 'ewma_title', value: '' },
    ],
    title: { text: { expr: 'title_text' }, subtitle: signalText('subtitle_text'), subtitleColor: PALETTE.muted, subtitleFontSize: 10 },
    vconcat: withEwma ? [individuals, ewmaPanel] : [individuals],
    spacing: 14,
    resolve: { scale: { x: 'shared' } },
  } satisfies TopLevelSpec;
}

export async function renderControlChart(
  series: ControlSeries,
  context: ControlChartContext = {},
  options: ChartOptions = {},
): Promise<string> {
  const label = `Control chart of ${propertyAxisTitle(series.property)} over test date for ${groupLabel(series.group)}`;
  const input = controlChartInput(series, context, options);
  const width = options.width ?? 470;
  const height = options.height ?? 170;
  const withEwma = input.data.ewma_rows.length > 0;
  // the template without the EWMA panel has no EWMA data sets
  const { ewma_rows: _rows, ewma_center: _center, ...individualsData } = input.data;
  return renderTemplateToSvg(
    `control:${width}x${height}:${withEwma}`,
    () => controlChartTemplate(width, height, withEwma),
    withEwma ? input : { signals: input.signals, data: individualsData },
    { idPrefix: options.idPrefix, label },
  );
}
