/**
 * Shows an open-ended stage object (idealization, provenance, comparison cells) as escaped
 * text: numbers in their shortest form to 6 significant digits, flat string maps as "k v · k v", anything else as
 * compact JSON.
 */
import { escapeHtml } from './html-escape.ts';
import { formatShort } from './format-number.ts';
import type { JsonValue } from './types.ts';

export function jsonText(value: JsonValue): string {
  if (value === null) return '–';
  if (typeof value === 'number') return formatShort(value, 6);
  if (typeof value === 'string') return value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) {
    if (value.every((v) => typeof v === 'number' || typeof v === 'string')) return value.map((v) => jsonText(v)).join(', ');
    return JSON.stringify(value);
  }
  const entries = Object.entries(value as Record<string, JsonValue>);
  if (entries.every(([, v]) => typeof v === 'string')) return entries.map(([k, v]) => `${k} ${v as string}`).join(' · ');
  return JSON.stringify(value);
}

/** A definition list of the object's keys; empty object gives an "—" line. */
export function jsonDefinitionList(object: Readonly<Record<string, JsonValue>>): string {
  const entries = Object.entries(object);
  if (entries.length === 0) return '<p class="empty">–</p>';
  return `<dl class="kv">${entries.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(jsonText(v))}</dd>`).join('')}</dl>`;
}
