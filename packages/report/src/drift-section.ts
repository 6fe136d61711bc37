/**
 * The drift section: alerts (state, rule, when each would have rung and the estimated start of
 * the shift, magnitude, tests named), change points with their interval and detection date, the
 * supplier comparisons drawn (box plots and Games–Howell intervals) with their test results, and
 * one control chart per series — with moving-range, CUSUM and EWMA panels where the series has
 * alerts. Long tables are cut with a count.
 */
import { chartFigure } from './chart-figure.ts';
import { renderComparisonChart } from './comparison-chart.ts';
import { renderControlChart } from './control-chart.ts';
import { formatInteger, formatSignificant, MISSING } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import { htmlTable } from './html-table.ts';
import { propertyAxisTitle, propertyLabel } from './property-labels.ts';
import type { DriftResult, DriftTestRef, ReportDrift } from './types.ts';

function refText(ref: DriftTestRef): string {
  return typeof ref === 'string' ? ref : ref.lab ? `${ref.lab}/${ref.test_id}` : ref.test_id;
}

function testsText(tests: readonly DriftTestRef[]): string {
  const shown = tests.slice(0, 6).map(refText).join(', ');
  return tests.length > 6 ? `${shown} … (${tests.length} in all)` : shown;
}

function magnitudeText(magnitude: number | null, unit: string | undefined, property: string): string {
  const value = formatSignificant(magnitude, 3);
  if (magnitude === null || unit === undefined) return value;
  if (unit === 'sd') return `${value} σ`;
  if (unit === 'property-units') return `${value} ${propertyLabel(property).unit}`;
  if (unit === 'fraction') return `${formatSignificant(magnitude * 100, 3)} % of tests`;
  return `${value} ${unit}`;
}

function propertyName(property: string): string {
  const l = propertyLabel(property);
  return `${l.name} [${l.unit}]`;
}

function stateText(a: DriftResult['alerts'][number]): string {
  const state = a.state ?? 'open';
  const who = a.state_by ? ` (${a.state_by}${a.state_note ? `: ${a.state_note}` : ''})` : '';
  return `${a.new ? 'new · ' : ''}${state}${who}`;
}

function intervalText(ci: unknown): string {
  if (Array.isArray(ci) && ci.length === 2 && ci.every((x) => typeof x === 'number')) return `[${formatSignificant(ci[0], 3)}, ${formatSignificant(ci[1], 3)}]`;
  return MISSING;
}

export function driftTables(result: DriftResult, maxRows: number): string {
  const alerts = htmlTable(
    [{ header: 'id' }, { header: 'state' }, { header: 'group' }, { header: 'property' }, { header: 'rule' }, { header: 'chart' }, { header: 'detected on' }, { header: 'shift began' }, { header: 'magnitude', numeric: true }, { header: 'tests' }],
    result.alerts.map((a) => [
      { text: a.id ?? MISSING, className: 'mono' },
      stateText(a),
      groupLabel(a.group),
      propertyName(a.property),
      { text: a.rule, className: 'mono' },
      a.chart === 'heat-means' ? 'heat means' : (a.chart ?? MISSING),
      a.detected_on ?? a.first_date,
      a.change_date ?? MISSING,
      magnitudeText(a.magnitude, a.magnitude_unit, a.property),
      { text: testsText(a.tests), className: 'mono' },
    ]),
    { maxRows, emptyText: 'No drift alerts.' },
  );
  const changes = htmlTable(
    [{ header: 'group' }, { header: 'property' }, { header: 'estimated start' }, { header: 'detected on' }, { header: 'shift', numeric: true }, { header: 'interval' }],
    result.change_points.map((c) => [groupLabel(c.group), propertyName(c.property), c.date, c.detected_on ?? 'not an alarm', formatSignificant(c.shift, 3), intervalText(c.ci)]),
    { maxRows, emptyText: 'No change points found.' },
  );
  const tests = htmlTable(
    [{ header: 'grade' }, { header: 'property' }, { header: 'test' }, { header: 'statistic', numeric: true }, { header: 'df' }, { header: 'p', numeric: true }, { header: 'pairs differing' }],
    result.comparisons.map((c) => [
      c.grade,
      propertyName(c.property),
      c.test === 'welch-anova' ? "Welch's ANOVA, Games–Howell pairs" : c.test === 'kruskal-wallis' ? "Kruskal–Wallis, Dunn's pairs (Holm)" : c.test,
      formatSignificant(c.statistic, 4),
      c.df.map((x) => formatSignificant(x, 3)).join(', '),
      formatSignificant(c.p, 2),
      c.pairwise
        .filter((p) => (p.ci ? p.ci[0] > 0 || p.ci[1] < 0 : (p.p_adjusted ?? p.p ?? 1) < 0.05))
        .map((p) => `${p.a} − ${p.b}`)
        .join('; ') || 'none',
    ]),
    { maxRows, emptyText: 'No comparisons (fewer than two suppliers with three or more tests in every grade).' },
  );
  return `<h3>Alerts</h3>
<p class="meta">“Detected on” is the date the alert would have rung for someone running drift on the data up to that day; “shift began” is the rule's estimate of when the change started.</p>
${alerts}
<h3>Change points</h3>
${changes}
<h3>Supplier comparison</h3>
${tests}`;
}

export async function renderDriftSection(drift: ReportDrift | null, maxRows: number): Promise<string> {
  if (!drift) {
    return `<section class="block" id="drift"><h2>Drift and control charts</h2><p class="empty">The drift stage has not been run.</p></section>`;
  }
  const plural = (n: number, word: string) => `${formatInteger(n)} ${word}${n === 1 ? '' : 's'}`;
  const comparisons: string[] = [];
  const drawn = drift.result.comparisons.filter((c) => c.test === 'welch-anova').slice(0, maxRows);
  for (let k = 0; k < drawn.length; k++) {
    const c = drawn[k];
    comparisons.push(chartFigure(await renderComparisonChart(c, `cmp${k + 1}`), `${propertyAxisTitle(c.property)} of grade ${c.grade} per supplier: boxes span the quartiles, the tick is the median, whiskers reach the last test within 1.5 IQR, the dot is the mean; right, each pair's difference of means with its Games–Howell interval (red where it excludes zero).`));
  }
  const charts: string[] = [];
  for (let k = 0; k < drift.series.length; k++) {
    const s = drift.series[k];
    const svg = await renderControlChart(s, drift.result, { idPrefix: `cc${k + 1}` });
    const what = s.point_label ?? 'tests';
    const lower = s.panels ? ' Below: moving range with its D4·MR̄ limit, the upper CUSUM (blue) and the lower one drawn downward (red) with ±h, and the EWMA with its limits.' : '';
    charts.push(chartFigure(svg, `${propertyAxisTitle(s.property)} of ${groupLabel(s.group)} by test date (${what}${s.structure_note ? `; ${s.structure_note}` : ''}): each point against the running centre and Shewhart limits of the points before it; large points lie outside them or are named by an alert; violet rules mark estimated change starts, red dotted rules alert detections.${lower}`));
  }
  const fresh = drift.new_alerts !== undefined ? ` (${drift.new_alerts} new since the last run)` : '';
  return `<section class="block" id="drift">
<h2>Drift and control charts</h2>
<p class="lead">${plural(drift.result.alerts.length, 'alert')}${fresh}, ${plural(drift.result.change_points.length, 'change point')}, ${drift.series.length} monitored series.</p>
${driftTables(drift.result, maxRows)}
${comparisons.length > 0 ? `<div class="cc-grid">\n${comparisons.join('\n')}\n</div>` : ''}
<h3>Control charts</h3>
${charts.length > 0 ? `<div class="cc-grid">\n${charts.join('\n')}\n</div>` : '<p class="empty">No monitored series.</p>'}
</section>`;
}
