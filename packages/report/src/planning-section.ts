/**
 * The sample-size planning section: per group and property, how the design value is expected to
 * move with more tests — a table (tests, tolerance factor, expected value with its 5–95 % range,
 * expected gain, spread of the estimate) and a chart of the same rows. Text says how the numbers
 * were made (the population as fitted, a seeded Monte Carlo of the design value's own rule), so
 * that a buyer can weigh more testing against a higher design value.
 */
import { chartFigure } from './chart-figure.ts';
import { formatFixed, formatInteger } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import { escapeHtml } from './html-escape.ts';
import { htmlTable } from './html-table.ts';
import { renderPlanningChart } from './planning-chart.ts';
import { propertyLabel } from './property-labels.ts';
import type { PlanningPlan, PropertyPlanning } from './types.ts';

const FACTORS = [
  { key: 'k', header: 'k', note: 'normal factor', digits: 3 },
  { key: 't', header: 't', note: 'Weibull factor', digits: 3 },
  { key: 'r', header: 'r', note: 'rank', digits: 0 },
] as const;

function planTable(p: PropertyPlanning & { plan: PlanningPlan }): string {
  const d = propertyLabel(p.property).decimals;
  const unit = propertyLabel(p.property).unit;
  const signed = (v: number | null) => (v === null ? formatFixed(v, d) : `${v >= 0 ? '+' : ''}${formatFixed(v, d)}`);
  const factors = FACTORS.filter((f) => p.plan.rows.some((r) => r.factors[f.key] !== undefined));
  return htmlTable(
    [
      { header: 'tests', numeric: true },
      { header: 'added', numeric: true },
      ...factors.map((f) => ({ header: f.header, note: f.note, numeric: true })),
      { header: 'expected value', note: unit, numeric: true },
      { header: '5–95 % range', note: unit, numeric: true },
      { header: 'expected gain', note: unit, numeric: true },
      { header: 'spread of the estimate', note: `SD, ${unit}`, numeric: true },
    ],
    p.plan.rows.map((r) => [
      formatInteger(r.n),
      formatInteger(r.added),
      ...factors.map((f) => formatFixed(r.factors[f.key], f.digits)),
      formatFixed(r.expected, d),
      r.added === 0 ? 'now' : `${formatFixed(r.p05, d)} – ${formatFixed(r.p95, d)}`,
      signed(r.gain),
      formatFixed(r.sd_fresh, d),
    ]),
    { className: 'data planning' },
  );
}

/** "added tests …" → "Added tests ….": a note from the pipeline as a sentence. */
function sentence(note: string): string {
  return `${note.charAt(0).toUpperCase()}${note.slice(1)}${note.endsWith('.') ? '' : '.'}`;
}

export async function planningSection(planning: readonly PropertyPlanning[] | undefined): Promise<string> {
  const head = '<section class="block" id="planning">\n<h2>Sample-size planning</h2>';
  if (!planning || planning.length === 0) return `${head}\n<p class="empty">No planning was computed.</p>\n</section>`;
  const parts: string[] = [];
  const notes: string[] = [];
  for (let i = 0; i < planning.length; i++) {
    const p = planning[i];
    const title = `${escapeHtml(groupLabel(p.group))} · ${escapeHtml(propertyLabel(p.property).name)}`;
    if (!p.plan) {
      notes.push(`<li>${title}: ${escapeHtml(p.note ?? 'no plan')}</li>`);
      continue;
    }
    const plan = p.plan;
    const svg = await renderPlanningChart({ ...p, plan }, { idPrefix: `plan${i + 1}` });
    const d = propertyLabel(p.property).decimals;
    parts.push(`<div class="plan">
<h3>${title}</h3>
<p class="lead">Now ${formatFixed(plan.value_now, d)} from ${formatInteger(plan.n_now)} tests (${escapeHtml(plan.method)}, coverage ${plan.level.coverage}, confidence ${plan.level.confidence}). The fitted ${escapeHtml(plan.model.model)} population's fractile is ${formatFixed(plan.population_fractile, d)}${plan.value_large_n !== null ? `; the value heads to ${formatFixed(plan.value_large_n, d)} as n grows` : ''}.${p.note ? ` ${escapeHtml(sentence(p.note))}` : ''}</p>
<div class="curve-row">
<div>${planTable({ ...p, plan })}</div>
${chartFigure(svg, 'Line: expected design value; band: its 5–95 % range after the added tests; diamond: the value now; dashed rules: the fitted population fractile and where the value heads as n grows.')}
</div>
</div>`);
  }
  const first = planning.find((p) => p.plan)?.plan;
  const how = first
    ? `Each row adds that many tests drawn from the population as fitted (the best fit by AIC) to the tests at hand and recomputes the design value by its own rule; ${formatInteger(first.replicates)} seeded replicates per row (seed ${first.seed}). The expected gain is what more testing is expected to add to the design value; the spread of the estimate is the standard deviation of the value from that many tests, which narrows with n. The tolerance factor falls with n. All of it assumes the population stays as fitted.`
    : '';
  return `${head}
<p class="lead">How the design value is expected to move with more tests. ${escapeHtml(how)}</p>
${parts.join('\n')}
${notes.length > 0 ? `<h3>Not planned</h3><ul class="warnings">${notes.join('')}</ul>` : ''}
</section>`;
}
