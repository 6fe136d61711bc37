/**
 * The one writer of CSV cells for every CSV the tool writes (command output `--format csv`,
 * properties.csv, the design curve exports): RFC 4180 quoting, and formula-safe text.
 *
 * CSV injection (OWASP, "CSV Injection"; common practice): a spreadsheet opens a cell that begins
 * with `=`, `+`, `-` or `@` (or a tab, carriage return or line feed, which trimming turns into such a start)
 * as a live formula. Text cells that begin so — also after leading spaces, and with the
 * full-width forms ＝＋－＠ — are prefixed with an apostrophe, which spreadsheets show as text and
 * hide; numbers stay numbers (`-1.5` is written as it is). Values from the user's files (ids,
 * grades, supplier names, heats) are text; `null`/`undefined` are empty cells; objects and arrays
 * are their JSON, as text.
 *
 * Comment lines (`# key: value`, before a table) carry JSON values; a spreadsheet splits them at
 * every comma, quoted or not. `commentJson` writes that JSON so no piece begins with a formula
 * character either: inside strings, a comma followed by one is written `\u002c`, and a string
 * that begins with one has it escaped the same way (JSON.parse reads both back unchanged).
 *
 * Written by hand: csv-stringify's `escape_formulas` option is the same rule (the test checks
 * the two agree), but it is a record writer; per cell it cost 4.3 µs against about 0.1 µs here,
 * which counts for 100,000-row exports written line by line.
 */

const FORMULA_START = /^[\t\r\n]|^[ ]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]/;
const NEEDS_QUOTES = /[",\r\n]/;

/** One text cell: apostrophe-prefixed when it could start a formula, quoted when needed. */
export function csvText(s: string): string {
  const safe = FORMULA_START.test(s) ? `'${s}` : s;
  return NEEDS_QUOTES.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** One cell of any value (see above). */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number' || typeof v === 'bigint' || typeof v === 'boolean') return String(v);
  if (typeof v === 'string') return csvText(v);
  if (v instanceof Date) return v.toISOString();
  return csvText(JSON.stringify(v));
}

/** One CSV line (no line break) of cells. */
export function csvLine(values: readonly unknown[]): string {
  let s = '';
  for (let i = 0; i < values.length; i++) s += (i > 0 ? ',' : '') + csvCell(values[i]);
  return s;
}

const unicodeEscape = (c: string) => '\\u' + c.charCodeAt(0).toString(16).padStart(4, '0');

/** The body of a JSON string literal with every formula start neutralized (see above). */
function neutralize(body: string): string {
  return body.replace(/(^|,)( *)([=+\-@\uFF1D\uFF0B\uFF0D\uFF20])/g, (_, comma: string, spaces: string, c: string) => (comma ? unicodeEscape(',') + spaces + c : spaces + unicodeEscape(c)));
}

/** JSON text of `value` whose pieces between commas never begin with a formula character. */
export function commentJson(value: unknown): string {
  const json = JSON.stringify(value) ?? 'null';
  return json.replace(/"(?:[^"\\]|\\.)*"/g, (lit) => '"' + neutralize(lit.slice(1, -1)) + '"');
}

/** A comment line `# key: value` with the value as comment-safe JSON. */
export function csvComment(key: string, value: unknown): string {
  return `# ${key}: ${commentJson(value)}`;
}
