/**
 * Reads one curve file into channels in canonical units (s, N, mm, MPa, mm/mm) with NIST SP 811
 * factors from @fractile/curves. Our format: header `name[unit]` cells (time, force, extension, crosshead,
 * stress, strain), `#` comment lines, comma delimiter, decimal point; anything else through a
 * column map. Unknown columns are ignored. Plain valid files in our format are read whole by a
 * fast hand-written reader (plain-curve.ts); everything else, and every rejection, streams through
 * csv-parse over a hashing, UTF-8-checking scanner.
 *
 * Rejections (with file, line, column): not_utf8, malformed_csv, missing_column (mapped column not
 * in the header), unknown_unit, missing_channel (neither force+extension, force+crosshead nor
 * stress+strain),
 * missing_value / not_a_number / not_finite (a cell), time_not_monotonic (time decreases),
 * curve_too_short (fewer than MIN_CURVE_POINTS points, which includes an empty or truncated file).
 */
import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { pipeline } from 'node:stream/promises';
import { CsvError, parse } from 'csv-parse';
import type { UnitDef } from '@fractile/curves';
import { unitFor } from '@fractile/curves';
import type { ChannelName, ColumnMap } from './column-map.ts';
import { CHANNELS, CHANNEL_QUANTITY } from './column-map.ts';
import { emptyTail, parseCell, splitHeader } from './parse-cell.ts';
import { checkRange } from './plausible-range.ts';
import type { Rejection } from './rejection.ts';
import { reject } from './rejection.ts';
import { readPlainCurve } from './plain-curve.ts';
import { NotUtf8Error, SourceScanner } from './source-scanner.ts';
import { showCell } from './text-cell.ts';
import { unknownUnitMessage } from './unit-message.ts';

export const MIN_CURVE_POINTS = 20;

/** files up to this size in our plain format are read whole by the fast reader (plain-curve.ts) */
const PLAIN_MAX_BYTES = 32 * 1024 * 1024;

export interface CurveChannels {
  nPoints: number;
  time: Float64Array | null;
  force: Float64Array | null;
  extension: Float64Array | null;
  crosshead: Float64Array | null;
  stress: Float64Array | null;
  strain: Float64Array | null;
}

export type CurveReadResult =
  | { ok: true; sha256: string; sizeBytes: number; channels: CurveChannels }
  | { ok: false; rejection: Rejection };

export interface CurveReadOptions {
  /** always use the general (csv-parse) reader, not the fast one for plain files */
  general?: boolean;
}

/** A Float64Array that grows by doubling. */
class Growable {
  buf = new Float64Array(1024);
  n = 0;
  push(v: number): void {
    if (this.n === this.buf.length) {
      const next = new Float64Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.n++] = v;
  }
  take(): Float64Array {
    return this.buf.slice(0, this.n);
  }
}

interface Bound {
  channel: ChannelName;
  index: number; // 0-based cell index
  def: UnitDef;
  values: Growable;
}

class Stop extends Error {
  constructor(readonly rejection: Rejection) {
    super(rejection.message);
  }
}

function bindDefault(file: string, line: number, header: string[]): Bound[] {
  const bound: Bound[] = [];
  header.forEach((cell, i) => {
    const { name, unit } = splitHeader(cell);
    if (!(CHANNELS as readonly string[]).includes(name)) return;
    const channel = name as ChannelName;
    if (bound.some((b) => b.channel === channel)) throw new Stop(reject(file, line, i + 1, 'malformed_csv', `channel "${channel}" appears twice in the header`));
    if (unit === null) throw new Stop(reject(file, line, i + 1, 'unknown_unit', `channel "${channel}" has no unit: write ${channel}[unit]`));
    const def = unitFor(CHANNEL_QUANTITY[channel], unit);
    if (!def) throw new Stop(reject(file, line, i + 1, 'unknown_unit', unknownUnitMessage(unit, channel, CHANNEL_QUANTITY[channel])));
    bound.push({ channel, index: i, def, values: new Growable() });
  });
  return bound;
}

function bindMapped(file: string, line: number, header: string[] | null, map: ColumnMap): Bound[] {
  const bound: Bound[] = [];
  for (const channel of CHANNELS) {
    const spec = map.channels[channel];
    if (!spec) continue;
    let index: number;
    if (typeof spec.column === 'number') {
      index = spec.column - 1;
      if (header && index >= header.length) throw new Stop(reject(file, line, 0, 'missing_column', `column ${spec.column} (${channel}) is beyond the ${header.length} columns of the header`));
    } else {
      const name = spec.column.trim();
      index = header ? header.findIndex((h) => h.trim() === name) : -1;
      if (index < 0 && header) index = header.findIndex((h) => h.trim().toLowerCase() === name.toLowerCase());
      if (index < 0) throw new Stop(reject(file, line, 0, 'missing_column', `column "${spec.column}" (${channel}) is not in the header`));
    }
    bound.push({ channel, index, def: spec.def, values: new Growable() });
  }
  return bound;
}

function checkChannels(file: string, line: number, bound: Bound[], header: string[] | null = null): void {
  const has = (c: ChannelName) => bound.some((b) => b.channel === c);
  // force with crosshead travel only is a usable record: its modulus is flagged as not
  // representative of the material and the yield values use the fitted slope (reduce stage)
  if ((has('force') && (has('extension') || has('crosshead'))) || (has('stress') && has('strain'))) return;
  const found = bound.map((b) => b.channel).join(', ') || 'none';
  const why = has('force') ? 'force without extension or crosshead, and no stress and strain' : has('stress') || has('strain') ? 'stress and strain must both be given' : 'no force and extension, and no stress and strain';
  const other = header?.length === 1 ? ([';', '\t'].find((d) => header[0].includes(d)) ?? null) : null;
  const hint = other ? `; the header looks ${other === ';' ? 'semicolon' : 'tab'}-delimited: read such files through a column map (--map)` : '';
  throw new Stop(reject(file, line, 0, 'missing_channel', `${why} (channels found: ${found})${hint}`));
}

/**
 * Reads and validates the curve file at `absPath`; `displayPath` names it in rejections.
 */
export async function readCurveFile(absPath: string, displayPath: string, map: ColumnMap | null, opts: CurveReadOptions = {}): Promise<CurveReadResult> {
  if (!map && !opts.general) {
    const plain = await readPlainFile(absPath);
    if (plain) return plain;
  }
  return readGeneral(absPath, displayPath, map, opts);
}

/** The fast reader's result for a plain, valid file; null otherwise (including read errors). */
async function readPlainFile(absPath: string): Promise<CurveReadResult | null> {
  let buf: Buffer;
  try {
    const fh = await open(absPath, 'r');
    try {
      const st = await fh.stat();
      if (!st.isFile() || st.size > PLAIN_MAX_BYTES) return null;
      buf = await fh.readFile();
    } finally {
      await fh.close();
    }
  } catch {
    return null;
  }
  const r = readPlainCurve(buf, MIN_CURVE_POINTS);
  if (!r) return null;
  const v = r.values;
  return {
    ok: true,
    sha256: r.sha256,
    sizeBytes: r.sizeBytes,
    channels: { nPoints: r.nPoints, time: v.time ?? null, force: v.force ?? null, extension: v.extension ?? null, crosshead: v.crosshead ?? null, stress: v.stress ?? null, strain: v.strain ?? null },
  };
}

/** The general, streaming reader (csv-parse): any dialect, and every rejection. */
async function readGeneral(absPath: string, displayPath: string, map: ColumnMap | null, _opts: CurveReadOptions): Promise<CurveReadResult> {
  const file = displayPath;
  const decimal = map?.decimal ?? '.';
  const skip = map ? (map.headerRow > 0 ? map.headerRow - 1 : map.dataRow - 1) : 0;
  // the scanner drops comment and empty lines and maps the parser's record number to the physical line
  const scanner = new SourceScanner(skip, map ? (map.commentPrefix ?? '\u0000') : '#');
  const parser = parse({
    delimiter: map?.delimiter ?? ',',
    relax_column_count: true,
    skip_empty_lines: true,
    // no trim here: cells are trimmed where read (parseCell, header names), which costs less
  });
  let bound: Bound[] | null = null;
  const headerWanted = !(map && map.headerRow === 0);
  let headerLine = 0;
  let lastLine = 0;
  /** cells of the header (or, without one, of the first data row): every row must have as many */
  let cells = 0;
  let n = 0;
  let time: Bound | undefined;
  let prevTime = -Infinity;

  const consume = async () => {
    let records = 0;
    for await (const rec of parser as AsyncIterable<string[]>) {
      const line = scanner.physicalLine(++records);
      if (!bound) {
        headerLine = line;
        bound = map ? bindMapped(file, line, rec, map) : bindDefault(file, line, rec);
        checkChannels(file, line, bound, rec);
        cells = rec.length;
        time = bound.find((b) => b.channel === 'time');
        continue;
      }
      if (map && line < map.dataRow) continue;
      lastLine = line;
      if (cells === 0) cells = rec.length;
      if (rec.length > cells && !emptyTail(rec, cells)) throw new Stop(reject(file, line, cells + 1, 'wrong_cell_count', `the row has ${rec.length} cells, the ${headerWanted ? 'header' : 'first row'} ${cells}: a decimal comma in a comma-delimited file? (read such files through a column map with "decimal": ",")`));
      for (const b of bound) {
        const r = parseCell(rec[b.index], decimal);
        if (!r.ok) {
          const what = r.code === 'missing_value' ? (rec.length <= b.index ? 'row ends before this column (truncated line?)' : 'empty cell') : r.code === 'not_finite' ? `not a finite number: ${showCell(rec[b.index])}` : `not a number: ${showCell(rec[b.index])}`;
          throw new Stop(reject(file, line, b.index + 1, r.code, `${b.channel}: ${what}`));
        }
        // an offset of 0 is not added: −0 stays −0, as the cell says
        const value = b.def.offset === 0 ? r.value * b.def.factor : r.value * b.def.factor + b.def.offset;
        const range = checkRange(b.def.quantity, value);
        if (range) throw new Stop(reject(file, line, b.index + 1, 'out_of_range', `${b.channel}: ${showCell(rec[b.index])} is ${range}`));
        b.values.push(value);
      }
      if (rec.length < cells) throw new Stop(reject(file, line, rec.length + 1, 'wrong_cell_count', `the row has ${rec.length} cells, the ${headerWanted ? 'header' : 'first row'} ${cells}: a missing delimiter or a cut row`));
      if (time) {
        const t = time.values.buf[n];
        if (t < prevTime) throw new Stop(reject(file, line, time.index + 1, 'time_not_monotonic', `time decreases from ${prevTime} s to ${t} s`));
        prevTime = t;
      }
      n++;
    }
  };

  try {
    if (!headerWanted) {
      bound = bindMapped(file, 0, null, map!);
      checkChannels(file, 0, bound);
      time = bound.find((b) => b.channel === 'time');
    }
    await Promise.all([pipeline(createReadStream(absPath), scanner, parser), consume()]);
  } catch (e) {
    scanner.destroy();
    parser.destroy();
    if (e instanceof Stop) return { ok: false, rejection: e.rejection };
    if (e instanceof NotUtf8Error) return { ok: false, rejection: reject(file, e.line, 0, 'not_utf8', e.message) };
    const err = e as { code?: string; lines?: number; message?: string };
    if (err.code === 'ENOENT' || err.code === 'EISDIR' || err.code === 'EACCES') return { ok: false, rejection: reject(file, 0, 0, err.code === 'ENOENT' ? 'missing_curve_file' : 'unreadable_file', `cannot read the curve file (${err.code})`) };
    if (e instanceof CsvError) {
      // an unclosed quote is found at the end of the file: name the line after the last row read;
      // the parser's own count can run past the file's lines (it counts CR and LF inside quotes)
      const line = e.code === 'CSV_QUOTE_NOT_CLOSED' ? (lastLine || headerLine) + 1 : Math.min(scanner.physicalLine(err.lines ?? 0), scanner.lines);
      return { ok: false, rejection: reject(file, line, 0, 'malformed_csv', e.message) };
    }
    throw e;
  }
  if (!bound || (headerWanted && headerLine === 0)) return { ok: false, rejection: reject(file, 0, 0, 'curve_too_short', 'empty curve file (no header, no points)') };
  if (n < MIN_CURVE_POINTS) return { ok: false, rejection: reject(file, lastLine || headerLine, 0, 'curve_too_short', `${n} points; a curve needs at least ${MIN_CURVE_POINTS}`) };
  const get = (c: ChannelName) => (bound as Bound[]).find((b) => b.channel === c)?.values.take() ?? null;
  return {
    ok: true,
    sha256: scanner.sha256,
    sizeBytes: scanner.bytes,
    channels: { nPoints: n, time: get('time'), force: get('force'), extension: get('extension'), crosshead: get('crosshead'), stress: get('stress'), strain: get('strain') },
  };
}
