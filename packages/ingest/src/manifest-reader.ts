/**
 * Reads a manifest (DESIGN "Manifest" format: CSV, one row per test, units in brackets in the
 * header) as a stream of validated records or rejections, one per row; a header problem
 * (missing required column, unknown unit) rejects the whole file at the header line.
 *
 * Quantities are converted to canonical units (mm, mm², °C, MPa, %) with the NIST SP 811 factors
 * of @fractile/curves, and S0 follows the shape (ISO 6892-1: round π·d²/4, flat a·b, or the area
 * given). Geometry and gauge length are required only where the curve needs them, so their absence
 * is carried as a pending rejection that the curve check raises.
 */
import { createReadStream, existsSync, realpathSync, statSync } from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { type CsvError, parse } from 'csv-parse';
import type { Quantity, SpecimenShape, UnitDef, YieldDefinition } from '@fractile/curves';
import { crossSectionArea, SPECIMEN_SHAPES, unitFor, YIELD_DEFINITIONS } from '@fractile/curves';
import { emptyTail, parseCell, parseIsoDate, splitHeader } from './parse-cell.ts';
import { checkRange } from './plausible-range.ts';
import type { Rejection } from './rejection.ts';
import { reject } from './rejection.ts';
import { NotUtf8Error, SourceScanner } from './source-scanner.ts';
import { showCell, textProblem } from './text-cell.ts';
import { unknownUnitMessage } from './unit-message.ts';


export interface SummaryValues {
  yieldMpa: number | null;
  yieldDefinition: YieldDefinition | null;
  tensileMpa: number | null;
  uniformElongationPct: number | null;
  elongationPct: number | null;
}

export interface ManifestRecord {
  line: number;
  lab: string;
  testId: string;
  grade: string;
  supplier: string;
  heat: string | null;
  testedOn: string;
  shape: SpecimenShape | null;
  diameterMm: number | null;
  thicknessMm: number | null;
  widthMm: number | null;
  /** S0 from the shape, or null where the geometry is not given */
  areaMm2: number | null;
  gaugeLengthMm: number | null;
  orientation: string | null;
  temperatureC: number | null;
  summary: SummaryValues | null;
  /** the curve file; `sizeBytes` as found when the manifest was read (bounds read-ahead memory) */
  curve: { relPath: string; absPath: string; displayPath: string; sizeBytes: number } | null;
  /** raised only if the curve needs S0 */
  geometryIssue: Rejection | null;
  /** raised only if the curve needs L0 */
  gaugeIssue: Rejection | null;
}

export type ManifestItem = { kind: 'record'; record: ManifestRecord } | { kind: 'rejection'; rejection: Rejection };

type Kind = 'text' | Quantity;
const COLUMNS: Record<string, Kind> = {
  test_id: 'text', lab: 'text', grade: 'text', supplier: 'text', heat: 'text', tested_on: 'text', shape: 'text',
  orientation: 'text', curve: 'text', yield_definition: 'text',
  diameter: 'length', thickness: 'length', width: 'length', gauge_length: 'length', area: 'area',
  temperature: 'temperature', yield: 'stress', tensile: 'stress', uniform_elongation: 'percent', elongation: 'percent',
};
const REQUIRED = ['test_id', 'grade', 'supplier', 'tested_on'];
const DIMENSIONS = new Set(['diameter', 'thickness', 'width', 'gauge_length', 'area']);

interface Col {
  index: number;
  def: UnitDef | null;
}

export interface FileScan {
  sha256: string;
  sizeBytes: number;
  /** number of lines (a last line without newline counts) */
  lines: number;
}

/** Hashes a file, counts its lines and checks it is UTF-8 (streaming); throws NotUtf8Error. */
export async function scanFile(absPath: string): Promise<FileScan> {
  const scanner = new SourceScanner(0);
  let lastByteNewline = true;
  scanner.on('data', (s: string) => {
    if (s.length) lastByteNewline = s.endsWith('\n');
  });
  await pipeline(createReadStream(absPath), scanner);
  const lines = scanner.lines - (lastByteNewline ? 1 : 0);
  return { sha256: scanner.sha256, sizeBytes: scanner.bytes, lines: Math.max(0, lines) };
}

/** True when `target` lies inside `folder` (after resolving symbolic links where they exist). */
export function insideFolder(folder: string, target: string): boolean {
  const rel = path.relative(folder, target);
  if (rel === '' || rel.startsWith('..' + path.sep) || rel === '..' || path.isAbsolute(rel)) return false;
  if (existsSync(target)) {
    const realRel = path.relative(realpathSync(folder), realpathSync(target));
    if (realRel === '' || realRel.startsWith('..' + path.sep) || realRel === '..' || path.isAbsolute(realRel)) return false;
  }
  return true;
}

/** A row the CSV parser could not read (a stray or unclosed quote), as a rejection. */
function csvRejection(file: string, err: CsvError, lastLine: number, endLine: number): Rejection {
  if (err.code === 'CSV_QUOTE_NOT_CLOSED') {
    const from = lastLine + 1;
    return reject(file, from, 0, 'malformed_csv', `a quoted cell opened on line ${from} or after is never closed: lines ${from}–${Math.max(from, endLine)} are not read`);
  }
  const line = Math.min((err as unknown as { lines?: number }).lines ?? lastLine + 1, Math.max(endLine, lastLine + 1));
  return reject(file, line, 0, 'malformed_csv', `${err.message} (the row is not read)`);
}

/**
 * Streams the manifest at `manifestPath` (as given: names the file in rejections). Throws
 * NotUtf8Error (the caller checks the file with scanFile first). A row the CSV parser cannot
 * read (a stray or unclosed quote) is a rejection at its line; the parser goes on after it.
 */
export async function* readManifest(manifestPath: string): AsyncGenerator<ManifestItem> {
  const file = manifestPath;
  const folder = path.dirname(path.resolve(manifestPath));
  const displayFolder = path.dirname(manifestPath);
  const skipped: CsvError[] = [];
  const parser = parse({
    comment: '#',
    comment_no_infix: true,
    relax_column_count: true,
    skip_empty_lines: true,
    trim: true,
    info: true,
    skip_records_with_error: true,
    on_skip: (err) => {
      if (err) skipped.push(err);
      return undefined;
    },
  });
  const scanner = new SourceScanner(0);
  const feeding = pipeline(createReadStream(manifestPath), scanner, parser);
  feeding.catch(() => {});
  let cols: Map<string, Col> | null = null;
  let headerCells = 0;
  let headerLine = 0;
  let lastLine = 0;
  // rejections of unreadable rows, each given out before the first record after it
  const pending = function* (before: number): Generator<ManifestItem> {
    while (skipped.length && ((skipped[0] as unknown as { lines?: number }).lines ?? 0) < before) yield { kind: 'rejection', rejection: csvRejection(file, skipped.shift()!, lastLine, scanner.lines) };
  };
  try {
    for await (const item of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      const line = item.info.lines;
      const rec = item.record;
      yield* pending(line);
      lastLine = line;
      if (!cols) {
        headerLine = line;
        const header = new Map<string, Col>();
        let bad: Rejection | null = null;
        rec.forEach((cell, i) => {
          if (bad) return;
          const { name, unit } = splitHeader(cell);
          const kind = COLUMNS[name];
          if (kind === undefined) return; // extra columns are kept out of the record, not an error
          if (header.has(name)) bad = reject(file, line, i + 1, 'malformed_csv', `column "${name}" appears twice in the header`);
          else if (kind === 'text') header.set(name, { index: i, def: null });
          else {
            const def = unit === null ? null : unitFor(kind, unit);
            if (!def) bad = reject(file, line, i + 1, 'unknown_unit', unit === null ? `column "${name}" needs a unit in brackets, e.g. ${name}[${kind === 'percent' ? '%' : kind === 'temperature' ? 'C' : kind === 'stress' ? 'MPa' : kind === 'area' ? 'mm2' : 'mm'}]` : unknownUnitMessage(unit, name, kind));
            else header.set(name, { index: i, def });
          }
        });
        const missing = REQUIRED.filter((r) => !header.has(r));
        if (!bad && missing.length) bad = reject(file, line, 0, 'missing_column', `required column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} not in the header`);
        if (bad) {
          yield { kind: 'rejection', rejection: bad };
          return;
        }
        cols = header;
        headerCells = rec.length;
        continue;
      }
      yield readRow(file, folder, displayFolder, line, rec, cols, headerCells);
    }
    await feeding;
    yield* pending(Infinity);
  } finally {
    parser.destroy();
  }
  if (!cols) yield { kind: 'rejection', rejection: reject(file, headerLine, 0, 'missing_column', 'empty manifest: no header row') };
}

class RowError extends Error {
  constructor(readonly rejection: Rejection) {
    super(rejection.message);
  }
}

function readRow(file: string, folder: string, displayFolder: string, line: number, rec: string[], cols: Map<string, Col>, headerCells: number): ManifestItem {
  if (rec.length < headerCells || (rec.length > headerCells && !emptyTail(rec, headerCells))) {
    // cells shift under the header when a value holds an unquoted comma (a decimal comma, "Acme,
    // Inc") or a delimiter went missing: every value after it would be read from the wrong column
    const more = rec.length > headerCells;
    const why = more ? 'an unquoted comma in a value (a decimal comma?) shifts the cells' : 'a missing delimiter or a cut row shifts the cells';
    return { kind: 'rejection', rejection: reject(file, line, (more ? headerCells : rec.length) + 1, 'wrong_cell_count', `the row has ${rec.length} cells, the header ${headerCells}: ${why}; quote values that contain commas`) };
  }
  const colOf = (name: string) => (cols.get(name)?.index ?? -1) + 1;
  const fail = (name: string, code: Rejection['code'], message: string): never => {
    throw new RowError(reject(file, line, colOf(name), code, message));
  };
  const text = (name: string): string | null => {
    const c = cols.get(name);
    if (!c) return null;
    const v = (rec[c.index] ?? '').trim();
    if (v === '') return null;
    const problem = textProblem(v);
    if (problem) fail(name, problem.code, `${name}: ${problem.message}`);
    return v;
  };
  const required = (name: string): string => text(name) ?? fail(name, 'missing_value', `${name} is required`);
  const quantity = (name: string): number | null => {
    const c = cols.get(name);
    if (!c) return null;
    const raw = rec[c.index];
    if (raw === undefined || raw.trim() === '') return null;
    const r = parseCell(raw);
    if (!r.ok) return fail(name, r.code, r.code === 'not_finite' ? `${name}: not a finite number: ${showCell(raw)}` : `${name}: not a number: ${showCell(raw)}`);
    const v = r.value * c.def!.factor + c.def!.offset;
    if (DIMENSIONS.has(name) && v <= 0) return fail(name, 'nonpositive_dimension', `${name} must be > 0, got ${showCell(raw)}`);
    const range = checkRange(c.def!.quantity, v);
    if (range) return fail(name, 'out_of_range', `${name}: ${showCell(raw)} is ${range}`);
    return v;
  };

  try {
    const testId = required('test_id');
    const lab = text('lab') ?? 'default';
    const grade = required('grade');
    const supplier = required('supplier');
    const dateRaw = required('tested_on');
    const testedOn = parseIsoDate(dateRaw) ?? fail('tested_on', 'invalid_date', `tested_on: not an ISO 8601 date (YYYY-MM-DD): ${showCell(dateRaw)}`);
    const shapeRaw = text('shape');
    let shape: SpecimenShape | null = null;
    if (shapeRaw !== null) {
      const s = shapeRaw.toLowerCase();
      if (!(SPECIMEN_SHAPES as readonly string[]).includes(s)) fail('shape', 'unknown_shape', `unknown shape ${showCell(shapeRaw)} (round, flat or area)`);
      shape = s as SpecimenShape;
    }
    const diameterMm = quantity('diameter');
    const thicknessMm = quantity('thickness');
    const widthMm = quantity('width');
    const givenAreaMm2 = quantity('area');
    const gaugeLengthMm = quantity('gauge_length');
    const temperatureC = quantity('temperature');
    if (temperatureC !== null && temperatureC <= -273.15) fail('temperature', 'nonpositive_value', `temperature below absolute zero: ${temperatureC} °C`);

    let areaMm2: number | null = null;
    let geometryIssue: Rejection | null = null;
    if (shape === null) geometryIssue = reject(file, line, colOf('shape'), 'missing_value', 'shape is required (round, flat or area) for a force–extension curve');
    else {
      const a = crossSectionArea({ shape, diameterMm, thicknessMm, widthMm, areaMm2: givenAreaMm2 });
      if (a.ok) areaMm2 = a.areaMm2;
      else if (a.code === 'nonpositive_dimension') fail(a.field, 'nonpositive_dimension', a.message);
      else geometryIssue = reject(file, line, colOf(a.field), cols.has(a.field) ? 'missing_value' : 'missing_column', `${a.field} is required for a ${shape} specimen with a force–extension curve`);
    }
    const gaugeIssue = gaugeLengthMm === null ? reject(file, line, colOf('gauge_length'), cols.has('gauge_length') ? 'missing_value' : 'missing_column', 'gauge_length is required for a curve with an extension channel') : null;

    const yieldMpa = quantity('yield');
    const tensileMpa = quantity('tensile');
    const uniformElongationPct = quantity('uniform_elongation');
    const elongationPct = quantity('elongation');
    for (const [name, v] of [['yield', yieldMpa], ['tensile', tensileMpa]] as const) if (v !== null && v <= 0) fail(name, 'nonpositive_value', `${name} must be > 0, got ${v} MPa`);
    for (const [name, v] of [['uniform_elongation', uniformElongationPct], ['elongation', elongationPct]] as const) if (v !== null && v < 0) fail(name, 'nonpositive_value', `${name} must be ≥ 0, got ${v} %`);
    const defRaw = text('yield_definition');
    let yieldDefinition: YieldDefinition | null = null;
    if (defRaw !== null) {
      const d = defRaw.toLowerCase();
      if (!(YIELD_DEFINITIONS as readonly string[]).includes(d)) fail('yield_definition', 'unknown_yield_definition', `unknown yield_definition ${showCell(defRaw)} (rp0.2, rt0.5, reh or rel)`);
      yieldDefinition = d as YieldDefinition;
    }
    if (yieldMpa !== null && yieldDefinition === null) fail(cols.has('yield_definition') ? 'yield_definition' : 'yield', 'missing_value', 'yield_definition is required where yield is given (rp0.2, rt0.5, reh or rel)');
    const hasSummary = yieldMpa !== null || tensileMpa !== null || uniformElongationPct !== null || elongationPct !== null;
    const summary = hasSummary ? { yieldMpa, yieldDefinition: yieldMpa === null ? null : yieldDefinition, tensileMpa, uniformElongationPct, elongationPct } : null;

    const curveRel = text('curve');
    let curve: ManifestRecord['curve'] = null;
    if (curveRel !== null) {
      const absPath = path.resolve(folder, curveRel);
      if (path.isAbsolute(curveRel) || !insideFolder(folder, absPath)) fail('curve', 'path_escapes_folder', `curve path ${showCell(curveRel)} leads outside the manifest's folder`);
      let isFile = false;
      let sizeBytes = 0;
      try {
        const st = statSync(absPath);
        isFile = st.isFile();
        sizeBytes = st.size;
      } catch {
        isFile = false;
      }
      if (!isFile) fail('curve', 'missing_curve_file', `curve file ${showCell(curveRel)} not found`);
      curve = { relPath: curveRel, absPath, displayPath: path.join(displayFolder, curveRel), sizeBytes };
    }
    if (!curve && !summary) fail(cols.has('curve') ? 'curve' : 'test_id', 'missing_value', 'a record needs a curve file or summary values (yield, tensile, elongations)');

    return {
      kind: 'record',
      record: {
        line, lab, testId, grade, supplier, heat: text('heat'), testedOn, shape, diameterMm, thicknessMm, widthMm, areaMm2,
        gaugeLengthMm, orientation: text('orientation'), temperatureC, summary, curve, geometryIssue, gaugeIssue,
      },
    };
  } catch (e) {
    if (e instanceof RowError) return { kind: 'rejection', rejection: e.rejection };
    throw e;
  }
}

export { NotUtf8Error };
