/**
 * The property tables of one group: population statistics with compliance against the
 * specification limits, and the characteristic values of every method the stats stage
 * reported (one column per method, the headline value marked). Values in the property's unit,
 * CoV and fractions in percent; the stats stage's warnings listed below.
 */
import { formatFixed, formatInteger, formatPercent, formatSignificant, MISSING } from './format-number.ts';
import { headlineCharacteristic } from './histogram-chart.ts';
import { escapeHtml } from './html-escape.ts';
import { htmlTable, type CellInput, type Column } from './html-table.ts';
import { propertyLabel } from './property-labels.ts';
import type { CharacteristicValue, ReportProperty } from './types.ts';

function methodNote(c: CharacteristicValue): string {
  const parts: string[] = [];
  if (c.coverage !== null) parts.push(`p ${formatFixed(c.coverage, 2)}`);
  if (c.confidence !== null) parts.push(`γ ${formatFixed(c.confidence, 2)}`);
  return parts.join(', ');
}

function leftOutText(l: ReportProperty['stats']['left_out']): string {
  if (!l || l.n === 0) return l ? '0' : MISSING;
  return `${formatInteger(l.n)} (${Object.entries(l.by_reason).map(([k, v]) => `${k.replace(/_/g, ' ')} ${formatInteger(v)}`).join(', ')})`;
}

function propertyCell(p: ReportProperty): CellInput {
  const label = propertyLabel(p.stats.property);
  return { html: `<span class="prop">${escapeHtml(label.name)}</span> <span class="unit">[${escapeHtml(label.unit)}]</span>` };
}

export function statisticsTable(properties: readonly ReportProperty[]): string {
  const columns: Column[] = [
    { header: 'property', note: 'unit' },
    { header: 'n', numeric: true },
    { header: 'mean', numeric: true },
    { header: 'sd', numeric: true },
    { header: 'CoV', numeric: true },
    { header: 'min', numeric: true },
    { header: 'p05', numeric: true },
    { header: 'median', numeric: true },
    { header: 'p95', numeric: true },
    { header: 'max', numeric: true },
    { header: 'best fit', note: 'AD p' },
    { header: 'spec', note: 'min / max', numeric: true },
    { header: 'n outside', note: 'below / above', numeric: true },
    { header: 'outside', note: 'fraction', numeric: true },
    { header: 'Cpk', numeric: true },
    { header: 'left out', note: 'values, by reason' },
  ];
  const rows = properties.map((p): CellInput[] => {
    const s = p.stats;
    const d = propertyLabel(s.property).decimals;
    const v = (x: number | null) => formatFixed(x, d);
    const c = s.compliance;
    const best = s.fits.find((f) => f.model === s.best_fit);
    return [
      propertyCell(p),
      formatInteger(s.n),
      v(s.mean),
      v(s.sd),
      formatPercent(s.cov, 1),
      v(s.min),
      v(s.percentiles.p05),
      v(s.median),
      v(s.percentiles.p95),
      v(s.max),
      s.best_fit === null ? MISSING : `${s.best_fit}${best ? ` (${formatSignificant(best.p, 2)})` : ''}`,
      c ? `${v(c.lower)} / ${v(c.upper)}` : MISSING,
      c ? `${formatInteger(c.n_below)} / ${formatInteger(c.n_above)}` : MISSING,
      c ? formatPercent(c.fraction_outside, 1) : MISSING,
      c ? formatSignificant(c.cpk, 3) : MISSING,
      leftOutText(s.left_out),
    ];
  });
  return htmlTable(columns, rows, { className: 'data props', emptyText: 'No property statistics for this group.' });
}

export function characteristicTable(properties: readonly ReportProperty[]): string {
  const methods: { method: string; note: string }[] = [];
  for (const p of properties) {
    for (const c of p.stats.characteristic) {
      if (!methods.some((m) => m.method === c.method)) methods.push({ method: c.method, note: methodNote(c) });
    }
  }
  if (methods.length === 0) return '<p class="empty">No characteristic values for this group.</p>';
  const columns: Column[] = [
    { header: 'property', note: 'unit' },
    { header: 'n', numeric: true },
    ...methods.map((m) => ({ header: m.method.replace(/[_-]/g, ' '), note: m.note || '\u00a0', numeric: true })),
  ];
  const rows = properties.map((p): CellInput[] => {
    const s = p.stats;
    const d = propertyLabel(s.property).decimals;
    const headline = headlineCharacteristic(p);
    return [
      propertyCell(p),
      formatInteger(s.n),
      ...methods.map((m): CellInput => {
        const found = s.characteristic.find((x) => x.method === m.method);
        if (!found) return MISSING;
        const own = methodNote(found);
        const text = own && own !== m.note ? `${formatFixed(found.value, d)} (${own})` : formatFixed(found.value, d);
        const isHeadline = headline !== null && found.method === headline.method;
        return { text, numeric: true, className: isHeadline ? 'char headline' : 'char' };
      }),
    ];
  });
  return htmlTable(columns, rows, { className: 'data chars', emptyText: 'No characteristic values for this group.' });
}

/**
 * The design value of each property — the headline the stats stage's rule chose — boxed, with its
 * method and how the rule resolved; the rules are stated below the table.
 */
export function designValueTable(properties: readonly ReportProperty[]): string {
  const columns: Column[] = [{ header: 'property', note: 'unit' }, { header: 'n', numeric: true }, { header: 'design value', numeric: true }, { header: 'method', note: 'coverage, confidence' }, { header: 'basis' }];
  const rows = properties.map((p): CellInput[] => {
    const h = headlineCharacteristic(p);
    const d = propertyLabel(p.stats.property).decimals;
    return [
      propertyCell(p),
      formatInteger(p.stats.n),
      h ? { text: formatFixed(h.value, d), numeric: true, className: 'char headline design' } : MISSING,
      h ? `${h.method.replace(/[_-]/g, ' ')} (${methodNote(h)})` : MISSING,
      p.stats.headline_basis ? p.stats.headline_basis.replace(/-/g, ' ') : MISSING,
    ];
  });
  const rules = [...new Set(properties.map((p) => p.stats.headline_rule).filter((r): r is string => typeof r === 'string'))];
  return `${htmlTable(columns, rows, { className: 'data chars design', emptyText: 'No design values for this group.' })}${rules.length > 0 ? `\n<p class="lead rule">Rule, fixed before the data: ${rules.map((r) => escapeHtml(r)).join(' · ')}</p>` : ''}`;
}

/** The tables and the warnings of the stats stage. */
export function propertyTable(properties: readonly ReportProperty[]): string {
  const warnings = properties
    .filter((p) => p.stats.warnings.length > 0)
    .map((p) => `<li><span class="prop">${escapeHtml(propertyLabel(p.stats.property).name)}</span>: ${escapeHtml(p.stats.warnings.join('; '))}</li>`);
  return `${statisticsTable(properties)}
<h3>Design values</h3>
<p class="lead">One design value per property (the headline): the value marked in each histogram and the one the characteristic curve starts from.</p>
${designValueTable(properties)}
<h3>Characteristic values</h3>
<p class="lead">Lower-fractile estimates by method (p coverage, γ confidence): the boxed one is the design value, the others are alternatives.</p>
${characteristicTable(properties)}${warnings.length > 0 ? `\n<ul class="warnings">${warnings.join('')}</ul>` : ''}`;
}
