/**
 * Commented header block of the design CSV exports: one `# key: value` line per entry, the value
 * as JSON so that every field reads back exactly; a first line naming the table and its format
 * version. Lines of the header that are not `key: value` are kept as free text and ignored.
 */
import { csvComment } from '../csv-cell.ts';
import type { DesignError, DesignResult } from './types.ts';

/** The header block; values as comment-safe JSON (csv-cell.ts: no formula start between commas). */
export function headerLines(title: string, entries: readonly [string, unknown][]): string[] {
  return [`# ${title}`, ...entries.map(([k, v]) => csvComment(k, v))];
}

export interface ParsedHeader {
  title: string | null;
  values: Map<string, unknown>;
  /** 1-based line where the table (first non-comment line) begins. */
  bodyLine: number;
}

export function parseHeader(text: string): DesignResult<ParsedHeader> {
  const lines = text.split(/\r?\n/);
  const values = new Map<string, unknown>();
  let title: string | null = null;
  let i = 0;
  for (; i < lines.length; i++) {
    const line = lines[i];
    if (!line.startsWith('#')) break;
    const body = line.slice(1).trimStart();
    if (i === 0) {
      title = body;
      continue;
    }
    const m = /^([A-Za-z0-9_]+): (.*)$/.exec(body);
    if (!m) continue;
    try {
      values.set(m[1], JSON.parse(m[2]));
    } catch (e) {
      const error: DesignError = { code: 'bad_header', message: `header entry "${m[1]}" is not valid JSON: ${(e as Error).message}`, location: { line: i + 1, column: line.indexOf(':') + 3 } };
      return { ok: false, error };
    }
  }
  return { ok: true, value: { title, values, bodyLine: i + 1 } };
}
