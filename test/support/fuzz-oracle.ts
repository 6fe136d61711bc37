/**
 * An independent reading of our input formats (DESIGN "Input formats") for the ingest fuzz test:
 * what a manifest row or a curve file says, in canonical units, or `null` where it does not say
 * one clear thing. It shares no code with the readers: CSV fields come from csv-parse's sync API
 * (the reference library), numbers from Number() on cells of the decimal syntax, units from the
 * NIST SP 811 factors written out here, S0 from ISO 6892-1 (π·d²/4, a·b, or given), the
 * plausibility bounds restated. A stored value must equal this reading exactly.
 */
import { parse } from 'csv-parse/sync';

/** canonical = value · factor + offset (NIST SP 811 Appendix B; only units the fuzzer writes) */
const UNITS: Record<string, Record<string, number>> = {
  force: { N: 1, kN: 1000, lbf: 4.4482216152605 },
  length: { mm: 1, m: 1000, in: 25.4 },
  area: { mm2: 1, in2: 25.4 * 25.4 },
  stress: { MPa: 1, GPa: 1000, ksi: (1000 * 4.4482216152605) / (25.4 * 25.4) },
  time: { s: 1, ms: 1e-3 },
  strain: { 'mm/mm': 1, '%': 0.01 },
  percent: { '%': 1 },
  temperature: { C: 1 },
};
const BOUND: Record<string, number> = { force: 1e9, length: 1e6, area: 1e10, stress: 1e5, time: 1e9, strain: 100, percent: 1e4, temperature: 1e4 };
const CHANNEL_KIND: Record<string, string> = { time: 'time', force: 'force', extension: 'length', crosshead: 'length', stress: 'stress', strain: 'strain' };
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function decode(buf: Buffer): string | null {
  try {
    const s = new TextDecoder('utf-8', { fatal: true }).decode(buf);
    return s.charCodeAt(0) === 0xfeff ? s.slice(1) : s;
  } catch {
    return null;
  }
}

function header(cell: string): { name: string; unit: string | null } {
  const m = /^\s*([^[\]]*?)\s*\[\s*([^\]]*?)\s*\]\s*$/.exec(cell);
  return m ? { name: m[1].toLowerCase(), unit: m[2] } : { name: cell.trim().toLowerCase(), unit: null };
}

/** A number cell in a unit of `kind`, in canonical units; null if not a plain number, unit unknown or out of bounds. */
function quantity(cell: string, kind: string, unit: string | null): number | null {
  const t = cell.trim();
  const factor = unit === null ? undefined : UNITS[kind]?.[unit];
  if (!NUMBER.test(t) || factor === undefined) return null;
  const v = Number(t) * factor;
  return Number.isFinite(v) && Math.abs(v) <= BOUND[kind] ? v : null;
}

const sameCount = (rec: string[], n: number) => rec.length === n || (rec.length > n && rec.slice(n).every((c) => c.trim() === ''));

export interface CurveReading {
  n: number;
  channels: Record<string, number[]>;
}

/** The curve file's channels (our plain format: header `name[unit]`, `#` comments, commas). */
export function readCurve(buf: Buffer): CurveReading | null {
  const text = decode(buf);
  if (text === null) return null;
  const lines = text.split('\n').map((l) => (l.endsWith('\r') ? l.slice(0, -1) : l)).filter((l) => l !== '' && !l.startsWith('#'));
  let rows: string[][];
  try {
    rows = parse(lines.join('\n'), { relax_column_count: true }) as string[][];
  } catch {
    return null;
  }
  if (rows.length < 21) return null;
  const cols = rows[0].map(header);
  const channels: Record<string, number[]> = {};
  const bound: { i: number; name: string; unit: string | null }[] = [];
  cols.forEach((c, i) => {
    if (CHANNEL_KIND[c.name] !== undefined) bound.push({ i, ...c });
  });
  if (new Set(bound.map((b) => b.name)).size !== bound.length) return null;
  const has = (c: string) => bound.some((b) => b.name === c);
  if (!((has('force') && (has('extension') || has('crosshead'))) || (has('stress') && has('strain')))) return null;
  for (const b of bound) channels[b.name] = [];
  for (const row of rows.slice(1)) {
    if (!sameCount(row, cols.length)) return null;
    for (const b of bound) {
      const v = quantity(row[b.i] ?? '', CHANNEL_KIND[b.name], b.unit);
      if (v === null) return null;
      channels[b.name].push(v);
    }
  }
  const t = channels.time;
  if (t) for (let i = 1; i < t.length; i++) if (t[i] < t[i - 1]) return null;
  return { n: rows.length - 1, channels };
}

export interface ManifestRow {
  line: number;
  cells: Record<string, string>;
  units: Record<string, string | null>;
  /** false when its cell count differs from the header's: values would sit in the wrong columns */
  aligned: boolean;
}

/** The manifest's header and records (csv-parse, records in error skipped), with their lines. */
export function readManifestRows(buf: Buffer): { rows: ManifestRow[]; skippedLines: number[] } | null {
  const text = decode(buf);
  if (text === null) return null;
  const skippedLines: number[] = [];
  let recs: { record: string[]; info: { lines: number } }[];
  try {
    recs = parse(text, { comment: '#', comment_no_infix: true, relax_column_count: true, skip_empty_lines: true, trim: true, info: true, skip_records_with_error: true, on_skip: (e) => void skippedLines.push((e as unknown as { lines: number }).lines) }) as never;
  } catch {
    return null;
  }
  if (recs.length === 0) return { rows: [], skippedLines };
  const head = recs[0].record.map(header);
  const rows = recs.slice(1).map((r) => {
    const cells: Record<string, string> = {};
    const units: Record<string, string | null> = {};
    head.forEach((h, i) => {
      cells[h.name] = (r.record[i] ?? '').trim();
      units[h.name] = h.unit;
    });
    return { line: r.info.lines, cells, units, aligned: sameCount(r.record, head.length) };
  });
  return { rows, skippedLines };
}

/** What a stored test row must hold for this manifest row; null where the row does not say it clearly. */
export function expectedTest(row: ManifestRow): Record<string, unknown> | null {
  if (!row.aligned) return null;
  const c = row.cells;
  const text = (k: string) => (c[k] === undefined || c[k] === '' ? null : c[k]);
  const textOk = (v: string | null) => v === null || (v.length <= 256 && !v.includes('\u0000'));
  const num = (k: string, kind: string): number | null | undefined => (text(k) === null ? null : (quantity(c[k], kind, row.units[k] ?? null) ?? undefined));
  const out: Record<string, unknown> = {
    lab: text('lab') ?? 'default', test_id: text('test_id'), grade: text('grade'), supplier: text('supplier'), heat: text('heat'),
    tested_on: /^\d{4}-\d{2}-\d{2}$/.test(c.tested_on ?? '') ? c.tested_on : undefined, shape: text('shape')?.toLowerCase() ?? null,
    diameter_mm: num('diameter', 'length'), gauge_length_mm: num('gauge_length', 'length'),
    yield_mpa: num('yield', 'stress'), tensile_mpa: num('tensile', 'stress'), yield_definition: text('yield_definition')?.toLowerCase() ?? null,
  };
  // a yield definition without a yield says nothing and is not kept
  if (out.yield_mpa === null) out.yield_definition = null;
  if (Object.values(out).some((v) => v === undefined)) return null;
  for (const k of ['lab', 'test_id', 'grade', 'supplier', 'heat']) if (!textOk(out[k] as string | null)) return null;
  if (out.test_id === null || out.grade === null || out.supplier === null) return null;
  if (out.shape === 'round' && typeof out.diameter_mm === 'number') out.area_mm2 = (Math.PI * (out.diameter_mm as number) ** 2) / 4;
  return out;
}
