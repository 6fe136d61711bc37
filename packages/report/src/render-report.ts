/**
 * Renders the whole report as one self-contained HTML document: inline style sheet, inline
 * SVG charts rendered at build time, no scripts and no external resources, so it opens
 * offline. Every piece of text from the data is escaped. The caution is shown at the top and
 * at the bottom; an empty caution falls back to `DESIGN_VALUE_CAUTION`, so it is never dropped.
 */
import { DESIGN_VALUE_CAUTION } from './caution.ts';
import { renderDriftSection } from './drift-section.ts';
import { formatFixed, formatInteger } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import { groupAnchor, groupSection } from './group-section.ts';
import { escapeHtml } from './html-escape.ts';
import { htmlTable } from './html-table.ts';
import { planningSection } from './planning-section.ts';
import { qualitySection } from './quality-section.ts';
import { REPORT_CSS } from './report-style.ts';
import type { ReportData, ReportMeta } from './types.ts';

const DEFAULT_MAX_ROWS = 200;

/** "yield_min_mpa" → "yield min … MPa"; other keys as they are. */
function specText(key: string, value: number): string {
  const m = /^(.+?)_(min|max)(?:_(mpa|pct))?$/.exec(key);
  if (!m) return `${key} ${formatFixed(value, 2)}`;
  const name = m[1] === 'yt' ? 'Y/T' : m[1].replace(/_/g, ' ');
  const unit = m[3] === 'mpa' ? ' MPa' : m[3] === 'pct' ? ' %' : '';
  return `${name} ${m[2]} ${formatFixed(value, m[3] === 'mpa' ? 0 : m[3] === 'pct' ? 1 : 2)}${unit}`;
}

function cautionBox(text: string, where: 'top' | 'bottom'): string {
  return `<aside class="caution caution-${where}" role="note"><strong>Caution</strong>${escapeHtml(text)}</aside>`;
}

function summarySection(meta: ReportMeta, data: ReportData): string {
  const c = meta.counts;
  const cards: [string, number][] = [
    ['tests', c.tests],
    ['with curve', c.curves],
    ['summary only', c.summary_only],
    ['rejected inputs', c.rejected],
    ['failed tests', c.failed],
    ['flagged tests', c.flagged],
    ...(c.excluded !== undefined ? [['excluded tests', c.excluded] as [string, number]] : []),
    ['groups', data.groups.length],
  ];
  const hashes = Object.entries(meta.settings_hashes).map(([k, v]) => [k, { text: v, className: 'mono' }]);
  const run = htmlTable(
    [{ header: 'item' }, { header: 'value' }],
    [
      ['generated', meta.generated_at],
      ['code version', { text: meta.code_version, className: 'mono' }],
      ['database', `${meta.database.engine} · ${meta.database.target}`],
      ['catalog', meta.catalog.source ?? 'built-in defaults (no limits)'],
      ...(meta.catalog.hash ? [['catalog hash', { text: meta.catalog.hash, className: 'mono' }] as const] : []),
      ...hashes.map(([k, v]) => [`settings · ${k as string}`, v] as const),
    ].map((r) => [...r]),
    { className: 'data run' },
  );
  const grades = htmlTable(
    [{ header: 'grade' }, { header: 'family' }, { header: 'yield definition' }, { header: 'specification limits' }],
    meta.catalog.grades.map((g) => [
      g.grade,
      g.family ?? '–',
      g.yield_definition ?? '–',
      {
        html:
          Object.entries(g.spec ?? {})
            .filter((e): e is [string, number] => e[1] !== null && Number.isFinite(e[1]))
            .map(([k, v]) => `<span class="nowrap">${escapeHtml(specText(k, v))}</span>`)
            .join(' · ') || '–',
      },
    ]),
    { emptyText: 'No grades in the catalog.' },
  );
  const toc = data.groups.map((g, i) => `<li><a href="#${groupAnchor(i)}">${escapeHtml(groupLabel(g.key))}</a></li>`).join('');
  return `<section class="block" id="summary">
<h2>Summary</h2>
<div class="cards">${cards.map(([label, n]) => `<div class="card"><div class="value">${formatInteger(n)}</div><div class="label">${escapeHtml(label)}</div></div>`).join('')}</div>
<div class="two-col">
<div><h3>Run</h3>${run}</div>
<div><h3>Grade catalog</h3>${grades}</div>
</div>
<nav class="toc"><h3>Groups</h3><ol>${toc}</ol>
<p class="meta"><a href="#drift">Drift and control charts</a> · <a href="#planning">Sample-size planning</a> · <a href="#quality">Data quality</a></p></nav>
</section>`;
}

export async function renderReport(data: ReportData): Promise<string> {
  const caution = data.caution !== undefined && data.caution.trim() !== '' ? data.caution : DESIGN_VALUE_CAUTION;
  const maxRows = data.options?.max_rows ?? DEFAULT_MAX_ROWS;
  const { meta } = data;
  const groups: string[] = [];
  for (let i = 0; i < data.groups.length; i++) groups.push(await groupSection(data.groups[i], i));
  const drift = await renderDriftSection(data.drift, maxRows);
  const planning = await planningSection(data.planning);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="fractile ${escapeHtml(meta.code_version)}">
<title>${escapeHtml(meta.title)}</title>
<style>${REPORT_CSS}</style>
</head>
<body>
<header class="top"><div class="inner">
<h1>${escapeHtml(meta.title)}</h1>
<p class="meta"><span>generated ${escapeHtml(meta.generated_at)}</span><span>code ${escapeHtml(meta.code_version)}</span><span>${escapeHtml(meta.database.engine)} · ${escapeHtml(meta.database.target)}</span><span>${formatInteger(meta.counts.tests)} tests in ${formatInteger(data.groups.length)} groups</span></p>
</div></header>
<main>
${cautionBox(caution, 'top')}
${summarySection(meta, data)}
${groups.join('\n')}
${drift}
${planning}
${qualitySection(data.quality, meta.counts, maxRows)}
${cautionBox(caution, 'bottom')}
</main>
<footer>fractile ${escapeHtml(meta.code_version)} · generated ${escapeHtml(meta.generated_at)} · all values from the data in ${escapeHtml(meta.database.engine)} · ${escapeHtml(meta.database.target)}</footer>
</body>
</html>
`;
}
