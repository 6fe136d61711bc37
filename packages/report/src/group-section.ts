/**
 * One group's section: the curves chart beside the idealization and provenance of the
 * characteristic curve, the property table, and one histogram per property.
 */
import { chartFigure } from './chart-figure.ts';
import { renderCurvesChart } from './curves-chart.ts';
import { formatInteger, formatShort } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import { headlineCharacteristic, renderHistogram } from './histogram-chart.ts';
import { escapeHtml } from './html-escape.ts';
import { idealizedPanel } from './idealized-panel.ts';
import { propertyAxisTitle } from './property-labels.ts';
import { propertyTable } from './property-table.ts';
import type { ReportGroup } from './types.ts';

/** What the characteristic curve bounds, said in the curve panel (pointwise unless stated otherwise). */
export function bandCaption(curve: { band?: 'pointwise' | 'simultaneous' }): string {
  return (curve.band ?? 'pointwise') === 'pointwise'
    ? 'The characteristic curve is a pointwise bound: at each plastic strain separately the stated share of the population lies above it with the stated confidence — not the whole curve at once.'
    : 'The characteristic curve is a simultaneous band: with the stated confidence it lies below the population’s lower fractile at every plastic strain of the valid range at once.';
}

export function groupAnchor(index: number): string {
  return `group-${index + 1}`;
}

export async function groupSection(group: ReportGroup, index: number): Promise<string> {
  const label = groupLabel(group.key);
  const prefix = `g${index + 1}`;
  const tests = group.properties.reduce((m, p) => Math.max(m, p.stats.n), group.curves?.n ?? 0);

  let curves = '<p class="empty">No characteristic curve for this group (no usable test curves).</p>';
  if (group.curves) {
    const svg = await renderCurvesChart(group.curves, group.sample_curves, { idPrefix: `${prefix}-curves` });
    const extrapolation =
      group.curves.extrapolated_from !== null
        ? ` Dashed beyond plastic strain ${formatShort(group.curves.extrapolated_from, 4)}: extrapolated by the fitted ${group.curves.extrapolation?.law ? `${group.curves.extrapolation.law} ` : ''}law, not measured.`
        : '';
    curves = `<div class="curve-row">
${chartFigure(svg, `Thin lines: ${group.sample_curves.length} of the group's test curves. Bold: median and characteristic true stress. Dotted rule: validity limit.${extrapolation} ${bandCaption(group.curves)}`)}
<div class="side">
${idealizedPanel(group.curves)}
</div>
</div>`;
  }

  const histograms: string[] = [];
  for (let j = 0; j < group.properties.length; j++) {
    const p = group.properties[j];
    const svg = await renderHistogram(p, { idPrefix: `${prefix}-h${j + 1}` });
    const headline = headlineCharacteristic(p);
    const caption = `${propertyAxisTitle(p.stats.property)}: bars are tests per bin, the curve the fitted ${p.stats.best_fit ?? 'model'} scaled to counts; solid rule the characteristic value${headline ? ` (${headline.method})` : ''}, dashed rules the specification limits.`;
    histograms.push(chartFigure(svg, caption));
  }

  return `<section class="block group" id="${groupAnchor(index)}">
<div class="group-head"><h2>${escapeHtml(label)}</h2><span class="n">${formatInteger(tests)} tests</span></div>
${curves}
<h3>Properties</h3>
${propertyTable(group.properties)}
${histograms.length > 0 ? `<div class="hist-grid">\n${histograms.join('\n')}\n</div>` : ''}
</section>`;
}
