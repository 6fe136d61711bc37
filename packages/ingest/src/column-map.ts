/**
 * Column maps: a JSON file that describes a curve-file dialect other than ours — delimiter,
 * decimal mark, header line, comment prefix and which column is which channel in which unit:
 *
 *   { "delimiter": ";", "decimal": ",", "header_row": 3, "data_row": 5, "comment_prefix": "#",
 *     "channels": { "time": {"column": "Zeit_s", "unit": "s"},
 *                   "force": {"column": "Last", "unit": "kN"},
 *                   "extension": {"column": 4, "unit": "mm"} } }
 *
 * `header_row`: 1-based physical line of the header (0 or absent: no header, columns must then be
 * 1-based indexes); `data_row`: first data line (default: the line after the header);
 * `column`: a header name (matched exactly, else ignoring case) or a 1-based index. Channels:
 * time, force, extension, crosshead, stress, strain. Our own curve format is the map-less default.
 */
import type { Quantity, UnitDef } from '@fractile/curves';
import { unitFor } from '@fractile/curves';
import { unknownUnitMessage } from './unit-message.ts';

export type ChannelName = 'time' | 'force' | 'extension' | 'crosshead' | 'stress' | 'strain';
export const CHANNELS: readonly ChannelName[] = ['time', 'force', 'extension', 'crosshead', 'stress', 'strain'];
export const CHANNEL_QUANTITY: Record<ChannelName, Quantity> = {
  time: 'time',
  force: 'force',
  extension: 'length',
  crosshead: 'length',
  stress: 'stress',
  strain: 'strain',
};

export interface ChannelSpec {
  column: string | number;
  unit: string;
  def: UnitDef;
}

export interface ColumnMap {
  delimiter: string;
  decimal: '.' | ',';
  /** 0 = no header */
  headerRow: number;
  dataRow: number;
  commentPrefix: string | null;
  channels: Partial<Record<ChannelName, ChannelSpec>>;
}

export type MapResult = { ok: true; map: ColumnMap } | { ok: false; message: string };

const KEYS = new Set(['delimiter', 'decimal', 'header_row', 'data_row', 'comment_prefix', 'channels', 'description']);

/** Validates a parsed map JSON value. */
export function parseColumnMap(value: unknown): MapResult {
  const bad = (message: string): MapResult => ({ ok: false, message });
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return bad('a column map must be a JSON object');
  const o = value as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!KEYS.has(k)) return bad(`unknown key "${k}" (allowed: ${[...KEYS].join(', ')})`);
  let delimiter = o.delimiter ?? ',';
  if (delimiter === 'tab' || delimiter === '\\t') delimiter = '\t';
  if (typeof delimiter !== 'string' || delimiter.length !== 1 || /[\r\n"0-9.]/.test(delimiter)) return bad(`"delimiter" must be one character (e.g. ",", ";", "\\t"), got ${JSON.stringify(o.delimiter)}`);
  const decimal = o.decimal ?? '.';
  if (decimal !== '.' && decimal !== ',') return bad(`"decimal" must be "." or ",", got ${JSON.stringify(o.decimal)}`);
  if (decimal === delimiter) return bad(`"decimal" and "delimiter" cannot both be "${decimal}"`);
  const headerRow = o.header_row ?? 1;
  if (typeof headerRow !== 'number' || !Number.isInteger(headerRow) || headerRow < 0) return bad(`"header_row" must be a whole number ≥ 0 (0: no header), got ${JSON.stringify(o.header_row)}`);
  const dataRow = o.data_row ?? headerRow + 1;
  if (typeof dataRow !== 'number' || !Number.isInteger(dataRow) || dataRow <= headerRow) return bad(`"data_row" must be a whole number after "header_row", got ${JSON.stringify(o.data_row)}`);
  let commentPrefix: string | null = '#';
  if (o.comment_prefix === null || o.comment_prefix === '') commentPrefix = null;
  else if (o.comment_prefix !== undefined) {
    if (typeof o.comment_prefix !== 'string' || o.comment_prefix.length !== 1) return bad(`"comment_prefix" must be one character or null, got ${JSON.stringify(o.comment_prefix)}`);
    commentPrefix = o.comment_prefix;
  }
  if (commentPrefix !== null && (commentPrefix === delimiter || commentPrefix === decimal)) return bad('"comment_prefix" must differ from the delimiter and the decimal mark');
  if (typeof o.channels !== 'object' || o.channels === null || Array.isArray(o.channels)) return bad('"channels" must be an object naming at least one channel');
  const channels: Partial<Record<ChannelName, ChannelSpec>> = {};
  for (const [name, spec] of Object.entries(o.channels as Record<string, unknown>)) {
    if (!(CHANNELS as readonly string[]).includes(name)) return bad(`unknown channel "${name}" (allowed: ${CHANNELS.join(', ')})`);
    if (typeof spec !== 'object' || spec === null) return bad(`channel "${name}" must be {"column": …, "unit": …}`);
    const s = spec as Record<string, unknown>;
    const column = s.column;
    if (typeof column === 'number') {
      if (!Number.isInteger(column) || column < 1) return bad(`channel "${name}": a column index is 1-based, got ${column}`);
    } else if (typeof column === 'string') {
      if (column.trim() === '') return bad(`channel "${name}": empty column name`);
      if (headerRow === 0) return bad(`channel "${name}": column names need a header row (set "header_row" or use 1-based indexes)`);
    } else return bad(`channel "${name}": "column" must be a header name or a 1-based index`);
    if (typeof s.unit !== 'string') return bad(`channel "${name}": "unit" is required`);
    const def = unitFor(CHANNEL_QUANTITY[name as ChannelName], s.unit);
    if (!def) return bad(`channel "${name}": ${unknownUnitMessage(s.unit, name, CHANNEL_QUANTITY[name as ChannelName])}`);
    channels[name as ChannelName] = { column, unit: s.unit, def };
  }
  if (Object.keys(channels).length === 0) return bad('"channels" must name at least one channel');
  return { ok: true, map: { delimiter, decimal, headerRow, dataRow, commentPrefix, channels } };
}

/** Parses and validates map text. */
export function parseColumnMapText(text: string): MapResult {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    return { ok: false, message: `not valid JSON: ${(e as Error).message}` };
  }
  return parseColumnMap(value);
}
