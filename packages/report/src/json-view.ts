/**
 * Shows an open-ended stage object (idealization, provenance, comparison cells) as escaped
 * text: numbers in their shortest form to 6 significant digits, long numeric arrays as a count
 * and range, flag arrays as a count of true, flat maps as "k v · k v", deeper nesting as
 * compact JSON.
 */
import { escapeHtml } from './html-escape.ts';
import { formatShort } from './format-number.ts';
import type { JsonValue } from './types.ts';

const LONG_ARRAY = 8;

function isObject(value: JsonValue): value is { readonly [key: string]: JsonValue } {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

function arrayText(values: readonly JsonValue[]): string {
  if (values.length === 0) return '(none)';
  if (values.every((v) => typeof v === 'boolean')) {
    return `${values.length} flags, ${values.filter((v) => v === true).length} set`;
  }
  if (values.length > LONG_ARRAY && values.every((v) => typeof v === 'number' || v === null)) {
    return `${values.length} values, ${jsonText(values[0])} … ${jsonText(values[values.length - 1])}`;
  }
  if (values.every((v) => !isObject(v) && !Array.isArray(v))) return values.map((v) => jsonText(v)).join(', ');
  return JSON.stringify(values);
}

export function jsonText(value: JsonValue): string {
  if (value === null) return '–';
  if (typeof value === 'number') return formatShort(value, 6);
  if (typeof value === 'string') return value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return arrayText(value);
  const entries = Object.entries(value as Record<string, JsonValue>);
  if (entries.length === 0) return '–';
  if (entries.every(([, v]) => !isObject(v))) return entries.map(([k, v]) => `${k} ${jsonText(v)}`).join(' · ');
  return JSON.stringify(value);
}

/** A definition list of the object's keys, leaving out `skip`; an empty object gives a dash. */
export function jsonDefinitionList(object: Readonly<Record<string, JsonValue>>, skip: readonly string[] = []): string {
  const entries = Object.entries(object).filter(([k]) => !skip.includes(k));
  if (entries.length === 0) return '<p class="empty">–</p>';
  const dd = (v: JsonValue): string => {
    if (!isObject(v)) return escapeHtml(jsonText(v));
    // a flat map of numbers and arrays gets one line per key; a map of labels stays on one line
    const values = Object.values(v);
    if (values.length > 1 && values.every((x) => !isObject(x)) && !values.every((x) => typeof x === 'string')) {
      return Object.entries(v as Record<string, JsonValue>)
        .map(([k, x]) => `<span class="kv-line">${escapeHtml(`${k} ${jsonText(x)}`)}</span>`)
        .join('');
    }
    return escapeHtml(jsonText(v));
  };
  return `<dl class="kv">${entries.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${dd(v)}</dd>`).join('')}</dl>`;
}
