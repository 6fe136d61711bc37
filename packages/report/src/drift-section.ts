/**
 * The drift section: alerts (rule, first date, magnitude, tests named), change points with
 * their interval, comparisons as the drift stage gives them, and one control chart per series
 * (rendered by the caller). Long tables are cut with a count.
 */
import { formatSignificant, MISSING } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import { htmlTable, type CellInput } from './html-table.ts';
import { jsonText } from './json-view.ts';
import { propertyLabel } from './property-labels.ts';
import type { DriftResult, DriftTestRef, JsonValue } from './types.ts';

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
  return `${value} ${unit}`;
}

function propertyName(property: string): string {
  const l = propertyLabel(property);
  return `${l.name} [${l.unit}]`;
}

export function driftTables(result: DriftResult, maxRows: number): string {
  const alerts = htmlTable(
    [{ header: 'group' }, { header: 'property' }, { header: 'rule' }, { header: 'first date' }, { header: 'magnitude', numeric: true }, { header: 'tests' }],
    result.alerts.map((a) => [
      groupLabel(a.group),
      propertyName(a.property),
      { text: a.rule, className: 'mono' },
      a.first_date,
      magnitudeText(a.magnitude, a.magnitude_unit, a.property),
      { text: testsText(a.tests), className: 'mono' },
    ]),
    { maxRows, emptyText: 'No drift alerts.' },
  );
  const changes = htmlTable(
    [{ header: 'group' }, { header: 'property' }, { header: 'date' }, { header: 'shift', numeric: true }, { header: 'interval' }],
    result.change_points.map((c) => [
      groupLabel(c.group),
      propertyName(c.property),
      c.date,
      formatSignificant(c.shift, 3),
      c.ci === null ? MISSING : jsonText(c.ci as JsonValue),
    ]),
    { maxRows, emptyText: 'No change points found.' },
  );
  const keys: string[] = [];
  for (const row of result.comparisons) for (const k of Object.keys(row)) if (!keys.includes(k)) keys.push(k);
  const comparisons = htmlTable(
    keys.map((k) => ({ header: k })),
    result.comparisons.map((row) =>
      keys.map((k): CellInput => {
        const v = row[k];
        if (v === undefined) return MISSING;
        if (k === 'group' && v !== null && typeof v === 'object' && !Array.isArray(v)) return groupLabel(v as Record<string, string>);
        if (k === 'property' && typeof v === 'string') return propertyName(v);
        return typeof v === 'number' ? { text: jsonText(v), numeric: true } : jsonText(v);
      }),
    ),
    { maxRows, emptyText: 'No comparisons.' },
  );
  return `<h3>Alerts</h3>
${alerts}
<h3>Change points</h3>
${changes}
<h3>Comparisons</h3>
${comparisons}`;
}
