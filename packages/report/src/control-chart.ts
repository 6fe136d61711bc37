/**
 * Control chart of one property of one group over test date: the individuals chart (values,
 * centre line, upper and lower control limits, specification limits) with points outside the
 * limits and the points named by drift alerts marked, change points as vertical rules, and
 * below it, where given, the EWMA panel with its limits (Montgomery, Introduction to
 * Statistical Quality Control; Lucas & Saccucci 1990). Dates are drawn on a UTC time axis.
 * Returns an SVG string.
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { formatFixed } from './format-number.ts';
import { groupId, groupLabel } from './group-label.ts';
import type { ChartOptions } from './histogram-chart.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderSpecToSvg } from './render-svg.ts';
import type { ChangePoint, ControlSeries, DriftAlert, DriftTestRef } from './types.ts';

export interface ControlChartContext {
  alerts?: readonly DriftAlert[];
  change_points?: readonly ChangePoint[];
}

const STATUS = ['in control', 'outside limits', 'alert'] as const;
type Status = (typeof STATUS)[number];

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

export function controlChartSpec(series: ControlSeries, context: ControlChartContext = {}, options: ChartOptions = {}): TopLevelSpec {
  const id = groupId(series.group);
  const mine = <T extends { group: ControlSeries['group']; property: string }>(rows: readonly T[] | undefined): T[] =>
    (rows ?? []).filter((r) => r.property === series.property && groupId(r.group) === id);
  const alerts = mine(context.alerts);
  const changes = mine(context.change_points);
  const label = propertyLabel(series.property);
  const width = options.width ?? 470;
  const yTitle = propertyAxisTitle(series.property);

  const points: { t: number; value: number; test_id: string; status: Status }[] = [];
  series.points.forEach((p) => {
    const t = toTime(p.date);
    if (t === null || !Number.isFinite(p.value)) return;
    const alerted = alerts.some((a) => a.tests.some((ref) => refMatches(ref, p.test_id, p.lab)));
    const outside = p.value > series.ucl || p.value < series.lcl;
    points.push({ t, value: p.value, test_id: p.test_id, status: alerted ? 'alert' : outside ? 'outside limits' : 'in control' });
  });

  const x = { field: 't', type: 'temporal' as const, title: 'test date [UTC]', scale: { type: 'utc' as const } };
  const limits = [
    { y: series.ucl, text: `UCL ${formatFixed(series.ucl, label.decimals)}`, kind: 'limit' },
    { y: series.center, text: `CL ${formatFixed(series.center, label.decimals)}`, kind: 'center' },
    { y: series.lcl, text: `LCL ${formatFixed(series.lcl, label.decimals)}`, kind: 'limit' },
    ...(series.spec_min != null && Number.isFinite(series.spec_min)
      ? [{ y: series.spec_min, text: `spec min ${formatFixed(series.spec_min, label.decimals)}`, kind: 'spec' }]
      : []),
    ...(series.spec_max != null && Number.isFinite(series.spec_max)
      ? [{ y: series.spec_max, text: `spec max ${formatFixed(series.spec_max, label.decimals)}`, kind: 'spec' }]
      : []),
  ].filter((l) => Number.isFinite(l.y));
  const limitStyle = {
    center: { color: PALETTE.median, dash: [1, 0] },
    limit: { color: PALETTE.alert, dash: [5, 3] },
    spec: { color: PALETTE.spec, dash: [2, 2] },
  } as const;
  const changeRules = changes
    .map((c) => ({ t: toTime(c.date), text: c.shift === null ? 'change' : `shift ${c.shift >= 0 ? '+' : ''}${formatFixed(c.shift, label.decimals)}` }))
    .filter((c): c is { t: number; text: string } => c.t !== null);

  const limitLayers = (['center', 'limit', 'spec'] as const).flatMap((kind) => {
    const rows = limits.filter((l) => l.kind === kind);
    if (rows.length === 0) return [];
    const style = limitStyle[kind];
    // control limits are labelled at the right end, specification limits inside at the left,
    // so a limit and a specification at nearly the same value stay readable
    const text =
      kind === 'spec'
        ? { type: 'text' as const, align: 'left' as const, baseline: 'bottom' as const, dy: -2, color: style.color, fontSize: 9.5 }
        : { type: 'text' as const, align: 'left' as const, dx: 4, color: style.color, fontSize: 9.5 };
    return [
      {
        data: { values: rows },
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
      },
    ];
  });

  const individuals = {
    width,
    height: options.height ?? 170,
    layer: [
      ...limitLayers,
      ...(changeRules.length > 0
        ? [
            {
              data: { values: changeRules },
              layer: [
                { mark: { type: 'rule' as const, color: PALETTE.ewma, strokeDash: [3, 2], strokeWidth: 1.2 }, encoding: { x } },
                {
                  mark: { type: 'text' as const, align: 'left' as const, baseline: 'top' as const, dx: 3, dy: 2, color: PALETTE.ewma, fontSize: 9.5 },
                  encoding: { x, y: { value: 0 }, text: { field: 'text' } },
                },
              ],
            },
          ]
        : []),
      {
        data: { values: points },
        layer: [
          {
            mark: { type: 'line' as const, color: PALETTE.sample, strokeWidth: 0.9 },
            encoding: {
              x,
              y: { field: 'value', type: 'quantitative' as const, title: yTitle, scale: { zero: false } },
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

  const ewma = series.ewma;
  const ewmaPanels = [];
  if (ewma && ewma.values.length > 0) {
    const rows: { t: number; ewma: number; ucl: number; lcl: number; status: 'inside' | 'outside' }[] = [];
    series.points.forEach((p, i) => {
      const t = toTime(p.date);
      const value = ewma.values[i];
      if (t === null || value === undefined || !Number.isFinite(value)) return;
      const ucl = limitAt(ewma.ucl, i);
      const lcl = limitAt(ewma.lcl, i);
      rows.push({ t, ewma: value, ucl, lcl, status: value > ucl || value < lcl ? 'outside' : 'inside' });
    });
    const ewmaTitle = `EWMA of ${label.name} [${label.unit}]`;
    const y = (field: string) => ({ field, type: 'quantitative' as const, title: ewmaTitle, scale: { zero: false } });
    ewmaPanels.push({
      width,
      height: 100,
      data: { values: rows },
      layer: [
        { mark: { type: 'line' as const, color: PALETTE.alert, strokeDash: [5, 3], strokeWidth: 1.1, interpolate: 'step-after' as const }, encoding: { x, y: y('ucl') } },
        { mark: { type: 'line' as const, color: PALETTE.alert, strokeDash: [5, 3], strokeWidth: 1.1, interpolate: 'step-after' as const }, encoding: { x, y: y('lcl') } },
        {
          data: { values: [{ y: ewma.center }] },
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
    });
  }

  const ewmaNote = ewma && ewma.lambda !== undefined ? ` · EWMA λ = ${ewma.lambda}${ewma.L !== undefined ? `, L = ${ewma.L}` : ''}` : '';
  return {
    title: {
      text: options.title ?? `${label.name} — ${groupLabel(series.group)}`,
      subtitle: `${points.length} tests · ${alerts.length} alert${alerts.length === 1 ? '' : 's'}${ewmaNote}`,
      subtitleColor: PALETTE.muted,
      subtitleFontSize: 10,
    },
    vconcat: [individuals, ...ewmaPanels],
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
  return renderSpecToSvg(controlChartSpec(series, context, options), { idPrefix: options.idPrefix, label });
}
