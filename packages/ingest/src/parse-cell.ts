/**
 * Strict reading of a numeric cell: plain decimal or scientific notation with the given decimal
 * mark; empty → missing, `NaN`/`inf`/`Infinity` (any case, signed) → not finite, anything else
 * that is not a number → not a number. Never returns NaN.
 */

export type CellResult = { ok: true; value: number } | { ok: false; code: 'missing_value' | 'not_a_number' | 'not_finite' };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const NONFINITE = /^[+-]?(nan|inf|infinity|∞)$/i;

export function parseCell(raw: string | undefined, decimal: '.' | ',' = '.'): CellResult {
  if (raw === undefined) return { ok: false, code: 'missing_value' };
  let s = raw.trim();
  if (s === '') return { ok: false, code: 'missing_value' };
  if (decimal === ',') {
    if (s.includes('.')) return { ok: false, code: 'not_a_number' };
    s = s.replace(',', '.');
  }
  if (NUMBER.test(s)) {
    const v = Number(s);
    return Number.isFinite(v) ? { ok: true, value: v } : { ok: false, code: 'not_finite' };
  }
  if (NONFINITE.test(s)) return { ok: false, code: 'not_finite' };
  return { ok: false, code: 'not_a_number' };
}

/** A strict ISO 8601 calendar date (YYYY-MM-DD, or a date-time whose date part is that); null if invalid. */
export function parseIsoDate(raw: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})(?:[T ][0-9:.]+(?:Z|[+-]\d{2}:?\d{2})?)?$/.exec(raw.trim());
  if (!m) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const dt = new Date(Date.UTC(y, mo - 1, d));
  if (dt.getUTCFullYear() !== y || dt.getUTCMonth() !== mo - 1 || dt.getUTCDate() !== d) return null;
  return `${m[1]}-${m[2]}-${m[3]}`;
}

/** Splits a header cell `name[unit]` into its parts (name lower-cased and trimmed). */
export function splitHeader(cell: string): { name: string; unit: string | null } {
  const m = /^\s*([^[\]]*?)\s*\[\s*([^\]]*?)\s*\]\s*$/.exec(cell);
  if (m) return { name: m[1].toLowerCase(), unit: m[2] };
  return { name: cell.trim().toLowerCase(), unit: null };
}

/** Whether every cell from `from` on is empty (a trailing delimiter, which shifts no value). */
export function emptyTail(rec: readonly string[], from: number): boolean {
  for (let i = from; i < rec.length; i++) if (rec[i].trim() !== '') return false;
  return true;
}
