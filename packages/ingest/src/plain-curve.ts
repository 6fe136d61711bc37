/**
 * Fast reading of a curve file in our own plain format (comma delimiter, decimal point, `#`
 * comment lines, a `name[unit]` header, plain numeric cells) from its whole buffer.
 *
 * Written by hand because csv-parse's per-record and per-field overhead dominated the ingest:
 * reading 400 files of 2,000 points (time, force, extension) in-process took 2.1 s through the
 * streaming csv-parse reader (0.38 M points/s, about half of it in the parser and its stream
 * plumbing) — slower than the database takes to COPY the same points. This reader only takes
 * the plain, valid case: it returns `null` for anything else (not UTF-8, a quote, a carriage
 * return, a row whose cell count differs from the header's, a cell that is not a plain finite
 * decimal number or whose converted value is outside the plausible range (plausible-range.ts),
 * time going back, too few points, a header problem), and the caller then reads
 * the file with the general reader (curve-reader.ts), which finds and reports the rejection. So
 * rejections (codes, lines, columns, messages) are by construction those of the general reader,
 * and an accepted file gives the same values: each cell must match the general reader's number
 * syntax `[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?` (spaces and tabs around it allowed, as trimmed
 * there), and its value is the correctly rounded double of its decimal text, as Number() gives.
 *
 * Numbers: a mantissa of at most 15 significant digits with a decimal power p, |p| ≤ 22, is
 * converted as m·10^p or m/10^-p — both operands are exact doubles, so the one IEEE-754 rounding
 * gives the correctly rounded result (Clinger, "How to read floating point numbers accurately",
 * PLDI 1990, the fast path); other cells go through Number() on the cell's text.
 */
import { createHash } from 'node:crypto';
import type { UnitDef } from '@fractile/curves';
import { unitFor } from '@fractile/curves';
import type { ChannelName } from './column-map.ts';
import { CHANNELS, CHANNEL_QUANTITY } from './column-map.ts';
import { splitHeader } from './parse-cell.ts';
import { inRange } from './plausible-range.ts';

export interface PlainCurve {
  sha256: string;
  sizeBytes: number;
  nPoints: number;
  values: Partial<Record<ChannelName, Float64Array>>;
}

const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
const decoder = new TextDecoder('utf-8', { fatal: true });

interface Col {
  channel: ChannelName;
  def: UnitDef;
  values: Float64Array;
}

/**
 * Reads `buf` as a plain curve file; `null` when the file is not plain and valid (the general
 * reader must then read it). `minPoints`: fewer data rows → `null`.
 */
export function readPlainCurve(buf: Uint8Array, minPoints: number): PlainCurve | null {
  let text: string;
  try {
    text = decoder.decode(buf); // a leading byte-order mark is dropped, as by the general reader
  } catch {
    return null;
  }
  if (text.indexOf('"') >= 0 || text.indexOf('\r') >= 0) return null;
  const len = text.length;
  let lines = 1;
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) lines++;

  // header: the first line that is neither empty nor a comment
  let pos = 0;
  let header: string[] | null = null;
  while (pos < len) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = len;
    if (end > pos && text.charCodeAt(pos) !== 0x23) {
      header = text.slice(pos, end).split(',');
      pos = end + 1;
      break;
    }
    pos = end + 1;
  }
  if (!header) return null;
  const byIndex: (Col | null)[] = new Array(header.length).fill(null);
  const cols: Col[] = [];
  for (let i = 0; i < header.length; i++) {
    const { name, unit } = splitHeader(header[i]);
    if (!(CHANNELS as readonly string[]).includes(name)) continue;
    const channel = name as ChannelName;
    if (unit === null || cols.some((c) => c.channel === channel)) return null;
    const def = unitFor(CHANNEL_QUANTITY[channel], unit);
    if (!def) return null;
    const col: Col = { channel, def, values: new Float64Array(lines) };
    cols.push(col);
    byIndex[i] = col;
  }
  const has = (c: ChannelName) => cols.some((b) => b.channel === c);
  if (!((has('force') && (has('extension') || has('crosshead'))) || (has('stress') && has('strain')))) return null;
  const time = cols.find((c) => c.channel === 'time') ?? null;
  const nCells = header.length;

  let n = 0;
  let prevTime = -Infinity;
  while (pos < len) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = len;
    if (end === pos || text.charCodeAt(pos) === 0x23) {
      pos = end + 1;
      continue;
    }
    let cell = 0;
    let s = pos;
    for (;;) {
      let e = text.indexOf(',', s);
      if (e < 0 || e > end) e = end;
      if (cell >= nCells) return null;
      const col = byIndex[cell];
      if (col) {
        // trim spaces and tabs
        let a = s;
        let b = e;
        while (a < b && (text.charCodeAt(a) === 0x20 || text.charCodeAt(a) === 0x09)) a++;
        while (b > a && (text.charCodeAt(b - 1) === 0x20 || text.charCodeAt(b - 1) === 0x09)) b--;
        // scan [+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?
        let i = a;
        let neg = false;
        let c = text.charCodeAt(i);
        if (c === 0x2b || c === 0x2d) {
          neg = c === 0x2d;
          c = text.charCodeAt(++i);
        }
        let m = 0;
        let sig = 0; // significant digits taken into m
        let digits = 0;
        let frac = 0;
        while (c >= 0x30 && c <= 0x39 && i < b) {
          if (m !== 0 || c !== 0x30) {
            m = m * 10 + (c - 0x30);
            sig++;
          }
          digits++;
          c = text.charCodeAt(++i);
        }
        if (c === 0x2e && i < b) {
          c = text.charCodeAt(++i);
          while (c >= 0x30 && c <= 0x39 && i < b) {
            if (m !== 0 || c !== 0x30) {
              m = m * 10 + (c - 0x30);
              sig++;
            }
            digits++;
            frac++;
            c = text.charCodeAt(++i);
          }
        }
        if (digits === 0) return null;
        let exp = 0;
        if ((c === 0x65 || c === 0x45) && i < b) {
          c = text.charCodeAt(++i);
          let eneg = false;
          if ((c === 0x2b || c === 0x2d) && i < b) {
            eneg = c === 0x2d;
            c = text.charCodeAt(++i);
          }
          let ed = 0;
          while (c >= 0x30 && c <= 0x39 && i < b) {
            if (exp < 100000) exp = exp * 10 + (c - 0x30);
            ed++;
            c = text.charCodeAt(++i);
          }
          if (ed === 0) return null;
          if (eneg) exp = -exp;
        }
        if (i !== b) return null;
        const p = exp - frac;
        let v: number;
        if (sig <= 15 && p >= -22 && p <= 22) {
          v = p >= 0 ? m * POW10[p] : m / POW10[-p];
          if (neg) v = -v;
        } else v = Number(text.slice(a, b));
        if (!Number.isFinite(v)) return null;
        // an offset of 0 is not added: −0 stays −0, as the cell says
        const value = col.def.offset === 0 ? v * col.def.factor : v * col.def.factor + col.def.offset;
        if (!inRange(col.def.quantity, value)) return null;
        col.values[n] = value;
      }
      cell++;
      if (e === end) break;
      s = e + 1;
    }
    if (cell !== nCells) return null;
    if (time) {
      const t = time.values[n];
      if (t < prevTime) return null;
      prevTime = t;
    }
    n++;
    pos = end + 1;
  }
  if (n < minPoints) return null;
  const values: Partial<Record<ChannelName, Float64Array>> = {};
  for (const c of cols) values[c.channel] = c.values.slice(0, n);
  return { sha256: createHash('sha256').update(buf).digest('hex'), sizeBytes: buf.length, nPoints: n, values };
}
