/**
 * The supplier comparison of one grade and property, drawn: a box plot per supplier (quartile
 * box, median tick, whiskers by Tukey's 1.5 × IQR rule, mean as a dot; Tukey 1977) beside the
 * Games–Howell simultaneous intervals of every pairwise difference of means (Games & Howell
 * 1976), with a rule at zero: an interval clear of zero is a difference at the stated level.
 * Returns an SVG string.
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import { renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { DriftComparison } from './types.ts';

export function comparisonChartInput(c: DriftComparison): TemplateInput {
  const label = propertyLabel(c.property);
  // '|' breaks a label into lines: supplier names are long
  const boxes = Object.entries(c.summaries).map(([group, b]) => ({ group: `${group}|n = ${b.n}`, ...b }));
  const pairs = c.pairwise
    .filter((p) => p.ci && typeof p.difference === 'number')
    .map((p) => ({ pair: `${p.a}|− ${p.b}`, difference: p.difference as number, lo: p.ci![0], hi: p.ci![1], clear: p.ci![0] > 0 || p.ci![1] < 0 ? 'differs' : 'no difference shown' }));
  const level = c.pairwise.find((p) => p.level !== undefined)?.level ?? 0.95;
  return {
    signals: {
      title_text: `${label.name} — grade ${c.grade}: suppliers compared`,
      subtitle_text: `Welch's ANOVA p = ${c.p.toPrecision(2)} · Games–Howell ${Math.round(level * 100)} % simultaneous intervals`,
      y_title: propertyAxisTitle(c.property),
      diff_title: `difference of means [${label.unit}]`,
    },
    data: { boxes, pairs, zero: [{ x: 0 }] },
  };
}

export function comparisonChartTemplate(): TopLevelSpec {
  const group = { field: 'group', type: 'nominal' as const, title: null, sort: null, axis: { labelAngle: 0, labelLimit: 400, labelExpr: "split(datum.label, '|')" } };
  const y = (field: string) => ({ field, type: 'quantitative' as const, scale: { zero: false }, title: signalText('y_title') });
  const boxes = {
    width: 230,
    height: 190,
    data: { name: 'boxes' },
    layer: [
      { mark: { type: 'rule' as const, color: PALETTE.muted }, encoding: { x: group, y: y('whisker_low'), y2: { field: 'whisker_high' } } },
      { mark: { type: 'bar' as const, color: PALETTE.bars, size: 22 }, encoding: { x: group, y: y('q1'), y2: { field: 'q3' } } },
      { mark: { type: 'tick' as const, color: PALETTE.median, thickness: 2, size: 22 }, encoding: { x: group, y: y('median') } },
      { mark: { type: 'point' as const, filled: true, color: PALETTE.characteristic, size: 24 }, encoding: { x: group, y: y('mean') } },
    ],
  };
  const x = (field: string) => ({ field, type: 'quantitative' as const, title: signalText('diff_title'), scale: { zero: false } });
  const pairY = { field: 'pair', type: 'nominal' as const, title: null, sort: null, axis: { labelLimit: 400, labelExpr: "split(datum.label, '|')" } };
  const colour = { field: 'clear', type: 'nominal' as const, scale: { domain: ['differs', 'no difference shown'], range: [PALETTE.alert, PALETTE.median] }, legend: { title: null, orient: 'bottom' as const } };
  const intervals = {
    width: 210,
    height: 190,
    layer: [
      { data: { name: 'zero' }, mark: { type: 'rule' as const, color: PALETTE.spec, strokeDash: [2, 2] }, encoding: { x: { field: 'x', type: 'quantitative' as const } } },
      {
        data: { name: 'pairs' },
        layer: [
          { mark: { type: 'rule' as const, strokeWidth: 2 }, encoding: { y: pairY, x: x('lo'), x2: { field: 'hi' }, color: colour } },
          { mark: { type: 'point' as const, filled: true, size: 30 }, encoding: { y: pairY, x: x('difference'), color: colour } },
        ],
      },
    ],
  };
  return {
    params: ['title_text', 'subtitle_text', 'y_title', 'diff_title'].map((name) => ({ name, value: '' })),
    title: { text: { expr: 'title_text' }, subtitle: signalText('subtitle_text'), subtitleColor: PALETTE.muted, subtitleFontSize: 10 },
    hconcat: [boxes, intervals],
    spacing: 24,
    resolve: { scale: { color: 'independent' } },
  } as TopLevelSpec;
}

export async function renderComparisonChart(c: DriftComparison, idPrefix?: string): Promise<string> {
  const label = `Box plots of ${propertyAxisTitle(c.property)} per supplier of grade ${c.grade} and Games–Howell intervals of their differences`;
  return renderTemplateToSvg('comparison', comparisonChartTemplate, comparisonChartInput(c), { idPrefix, label });
}
