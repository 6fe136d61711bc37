/**
 * Sample-size planning chart of one group and property: the expected design value against the
 * number of tests (now and with the added tests), its 5–95 % band, the value now as a point, and
 * horizontal rules at the fitted population fractile and at the value the method heads to as n
 * grows. Returns an SVG string. All planning charts share one structure (`planningTemplate`),
 * compiled once; each supplies its data (`planningInput`).
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { formatFixed } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import type { ChartOptions } from './histogram-chart.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { PlanningPlan, PropertyPlanning } from './types.ts';

const RULES = { domain: ['population fractile', 'where the value heads'], range: [PALETTE.fit, PALETTE.muted] };

/** Signals and data of one planning chart (the plan must be there). */
export function planningInput(p: PropertyPlanning & { plan: PlanningPlan }, options: ChartOptions = {}): TemplateInput {
  const plan = p.plan;
  const decimals = propertyLabel(p.property).decimals;
  const rows = plan.rows.filter((r) => r.expected !== null && Number.isFinite(r.expected));
  const band = rows.filter((r) => r.p05 !== null && r.p95 !== null).map((r) => ({ n: r.n, lo: r.p05, hi: r.p95 }));
  const rules: { y: number; kind: string; text: string }[] = [{ y: plan.population_fractile, kind: 'population fractile', text: `fractile of the fit ${formatFixed(plan.population_fractile, decimals)}` }];
  if (plan.value_large_n !== null && Math.abs(plan.value_large_n - plan.population_fractile) > 1e-9 * Math.abs(plan.population_fractile)) {
    rules.push({ y: plan.value_large_n, kind: 'where the value heads', text: `as n grows ${formatFixed(plan.value_large_n, decimals)}` });
  }
  const ys = [...rows.map((r) => r.expected as number), ...band.flatMap((b) => [b.lo as number, b.hi as number]), ...rules.map((r) => r.y)];
  const lo = Math.min(...ys);
  const hi = Math.max(...ys);
  const pad = (hi - lo || Math.abs(hi) * 0.01 || 1) * 0.08;
  return {
    signals: {
      y_lo: lo - pad,
      y_hi: hi + pad,
      y_title: `design value: ${propertyAxisTitle(p.property)}`,
      title_text: options.title ?? `${propertyLabel(p.property).name} · ${groupLabel(p.group)}`,
      subtitle_text: `${plan.method} at coverage ${plan.level.coverage}, confidence ${plan.level.confidence} · added tests from the ${plan.model.model} fit`,
    },
    data: { line: rows.map((r) => ({ n: r.n, y: r.expected })), band, now: [{ n: plan.n_now, y: plan.value_now }], rules },
  };
}

/** The chart structure shared by all planning charts; data sets `line`, `band`, `now`, `rules`. */
export function planningTemplate(width: number, height: number): TopLevelSpec {
  const x = { field: 'n', type: 'quantitative' as const, title: 'tests [count]', scale: { zero: false, nice: true } };
  const y = { type: 'quantitative' as const, title: signalText('y_title'), scale: { zero: false, nice: false, domain: { expr: '[y_lo, y_hi]' } } };
  return {
    width,
    height,
    params: [
      { name: 'y_lo', value: 0 },
      { name: 'y_hi', value: 1 },
      { name: 'y_title', value: '' },
      { name: 'title_text', value: '' },
      { name: 'subtitle_text', value: '' },
    ],
    title: { text: { expr: 'title_text' }, subtitle: signalText('subtitle_text'), subtitleColor: PALETTE.muted, subtitleFontSize: 10 },
    layer: [
      {
        data: { name: 'band' },
        mark: { type: 'area', color: PALETTE.characteristic, opacity: 0.16 },
        encoding: { x, y: { ...y, field: 'lo' }, y2: { field: 'hi' } },
      },
      {
        data: { name: 'line' },
        mark: { type: 'line', color: PALETTE.characteristic, strokeWidth: 2.2, point: { filled: true, size: 28, color: PALETTE.characteristic } },
        encoding: { x, y: { ...y, field: 'y' } },
      },
      {
        data: { name: 'now' },
        mark: { type: 'point', shape: 'diamond', size: 90, filled: true, color: PALETTE.ink },
        encoding: { x, y: { ...y, field: 'y' } },
      },
      {
        data: { name: 'rules' },
        layer: [
          {
            mark: { type: 'rule', strokeWidth: 1.2, strokeDash: [5, 3] },
            encoding: { y: { ...y, field: 'y' }, color: { field: 'kind', type: 'nominal', scale: RULES, legend: null } },
          },
          // the fractile's label at the right, the other at the left, so that close rules stay legible
          ...(['population fractile', 'where the value heads'] as const).map((kind, i) => ({
            transform: [{ filter: `datum.kind === '${kind}'` }],
            mark: { type: 'text' as const, align: i === 0 ? ('right' as const) : ('left' as const), baseline: 'bottom' as const, dy: -2, fontSize: 9.5 },
            encoding: { x: { value: i === 0 ? width : 0 }, y: { ...y, field: 'y' }, text: { field: 'text' }, color: { field: 'kind', type: 'nominal' as const, scale: RULES, legend: null } },
          })),
        ],
      },
    ],
  } satisfies TopLevelSpec;
}

export async function renderPlanningChart(p: PropertyPlanning & { plan: PlanningPlan }, options: ChartOptions = {}): Promise<string> {
  const label = `Expected design value of ${propertyAxisTitle(p.property)} for ${groupLabel(p.group)} against the number of tests, with its 5 to 95 % range`;
  const width = options.width ?? 340;
  const height = options.height ?? 180;
  return renderTemplateToSvg(`planning:${width}x${height}`, () => planningTemplate(width, height), planningInput(p, options), { idPrefix: options.idPrefix, label });
}
