/**
 * The property table of one group: population statistics, the characteristic values of every
 * method the stats stage reported (one column per method), and compliance with the
 * specification limits. Values in the property's unit, CoV and fractions in percent; the
 * stats stage's warnings listed below the table.
 */
import { formatFixed, formatInteger, formatPercent, formatSignificant, MISSING } from './format-number.ts';
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

export function propertyTable(properties: readonly ReportProperty[]): string {
  const methods: { method: string; note: string }[] = [];
  for (const p of properties) {
    for (const c of p.stats.characteristic) {
      if (!methods.some((m) => m.method === c.method)) methods.push({ method: c.method, note: methodNote(c) });
    }
  }
  const columns: Column[] = [
    { header: 'property', note: 'unit' },
    { header: 'n', numeric: true },
    { header: 'mean', numeric: true },
    { header: 'sd', numeric: true },
    { header: 'CoV', numeric: true },
    { header: 'min', numeric: true },
    { header: 'p05', numeric: true },
    { header: 'median', numeric: true },
    { header: 'max', numeric: true },
    { header: 'best fit' },
    ...methods.map((m) => ({ header: m.method.replace(/_/g, ' '), note: m.note ? `char. ${m.note}` : 'char.', numeric: true })),
    { header: 'spec', note: 'min / max', numeric: true },
    { header: 'n outside', note: 'below / above', numeric: true },
    { header: 'outside', note: 'fraction', numeric: true },
    { header: 'Cpk', numeric: true },
  ];
  const rows = properties.map((p): CellInput[] => {
    const s = p.stats;
    const label = propertyLabel(s.property);
    const d = label.decimals;
    const v = (x: number | null) => formatFixed(x, d);
    const c = s.compliance;
    const byMethod = methods.map((m): CellInput => {
      const found = s.characteristic.find((x) => x.method === m.method);
      if (!found) return MISSING;
      const own = methodNote(found);
      return { text: own && own !== m.note ? `${v(found.value)} (${own})` : v(found.value), numeric: true, className: 'char' };
    });
    return [
      { html: `<span class="prop">${label.name}</span> <span class="unit">[${label.unit}]</span>` },
      formatInteger(s.n),
      v(s.mean),
      v(s.sd),
      formatPercent(s.cov, 1),
      v(s.min),
      v(s.percentiles.p05),
      v(s.median),
      v(s.max),
      s.best_fit ?? MISSING,
      ...byMethod,
      c ? `${v(c.lower)} / ${v(c.upper)}` : MISSING,
      c ? `${formatInteger(c.n_below)} / ${formatInteger(c.n_above)}` : MISSING,
      c ? formatPercent(c.fraction_outside, 1) : MISSING,
      c ? formatSignificant(c.cpk, 3) : MISSING,
    ];
  });
  const table = htmlTable(columns, rows, { className: 'data props', emptyText: 'No property statistics for this group.' });
  // warnings of the stats stage under the table, one line per property that has any
  const warnings = properties
    .filter((p) => p.stats.warnings.length > 0)
    .map((p) => `<li><span class="prop">${escapeHtml(propertyLabel(p.stats.property).name)}</span>: ${escapeHtml(p.stats.warnings.join('; '))}</li>`);
  return warnings.length > 0 ? `${table}\n<ul class="warnings">${warnings.join('')}</ul>` : table;
}
