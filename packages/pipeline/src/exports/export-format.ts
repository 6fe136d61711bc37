/**
 * The shapes every output of the tool shares (README "Output formats"), for stdout and for files:
 *
 *   - JSON: one envelope `{ "kind", "caution", "provenance", "data" }`; `data` is the contract
 *     shape of the kind (full precision);
 *   - CSV: a documented comment block — `# <title>`, `# caution: …`, one `# key: value` line per
 *     provenance entry (value as comment-safe JSON, csv-cell.ts), one `# column <name>: meaning`
 *     line per column that needs one — then the header and the rows; numbers to 6 significant
 *     digits; or plain (no comment lines) with the same content in a sidecar JSON envelope whose
 *     `data` is `{ title, columns }`.
 *
 * Light on purpose (no stage code), so the command line can load it at start.
 */
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import { csvComment, csvLine } from '../csv-cell.ts';

/** Significant digits of numbers in CSV output. */
export const CSV_DIGITS = 6;

export type Row = Readonly<Record<string, unknown>>;

export interface Envelope<T = unknown> {
  kind: string;
  caution: string;
  provenance: Record<string, unknown>;
  data: T;
}

/** The JSON envelope as text (two-space indented, one line break at the end). */
export function jsonEnvelope(kind: string, provenance: Record<string, unknown>, data: unknown): string {
  const doc: Envelope = { kind, caution: DESIGN_VALUE_CAUTION, provenance, data };
  return JSON.stringify(doc, null, 2) + '\n';
}

/**
 * `v` to `digits` significant digits in its shortest form; integers below 10^15 unchanged
 * (counts, ids). Non-finite numbers as their JavaScript text.
 */
export function significant(v: number, digits: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (Number.isInteger(v) && Math.abs(v) < 1e15) return String(v);
  return String(Number(v.toPrecision(digits)));
}

// a number stays a number (csv-cell.ts writes it as is: a minus sign is not a formula)
const csvValue = (v: unknown, digits: number) => (typeof v === 'number' && Number.isFinite(v) ? Number(significant(v, digits)) : v);

/** Header and rows, every cell formula-safe (csv-cell.ts); numbers to `digits` significant digits. */
export function csvTable(rows: readonly Row[], columns?: readonly string[], digits = CSV_DIGITS): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  const lines = [csvLine(cols)];
  for (const r of rows) lines.push(csvLine(cols.map((c) => csvValue(r[c], digits))));
  return lines.join('\n') + '\n';
}

/** The comment block above a CSV table. */
export function csvCommentBlock(title: string, provenance: Record<string, unknown>, notes: Readonly<Record<string, string>> = {}): string {
  const lines = [`# ${title}`, `# caution: ${DESIGN_VALUE_CAUTION}`, ...Object.entries(provenance).map(([k, v]) => csvComment(k, v)), ...Object.entries(notes).map(([k, v]) => `# column ${k}: ${v}`)];
  return lines.join('\n') + '\n';
}

/** The sidecar of a plain CSV: the envelope with the title and the column notes as its data. */
export function csvSidecar(kind: string, title: string, provenance: Record<string, unknown>, notes: Readonly<Record<string, string>> = {}): string {
  return jsonEnvelope(kind, provenance, { title, columns: notes });
}

/** The sidecar's file name beside a CSV: `x.csv` → `x.csv.provenance.json`. */
export function sidecarName(csvFile: string): string {
  return `${csvFile}.provenance.json`;
}
