/**
 * Encoding of values for PostgreSQL's COPY text format (PostgreSQL documentation, "COPY", text
 * format): columns separated by tab, rows by newline, NULL as `\N`, and backslash, tab, newline
 * and carriage return escaped with a backslash. Arrays are written as array literals (`{1,2.5}`)
 * with elements double-quoted where the array syntax needs it. Numbers use JavaScript's shortest
 * round-trip form, so float8 values survive exactly. Non-finite numbers are written as PostgreSQL's
 * `NaN`/`Infinity`/`-Infinity` (the schema's checks reject them where they are not allowed).
 *
 * Written by hand: the few lines of escaping are simpler than any dependency.
 */

export type CopyValue = null | undefined | number | bigint | string | boolean | Date | ArrayLike<number> | readonly (string | number | null)[] | { [k: string]: unknown };

function num(v: number): string {
  if (Number.isFinite(v)) return v === 0 && 1 / v < 0 ? '-0' : String(v);
  return Number.isNaN(v) ? 'NaN' : v > 0 ? 'Infinity' : '-Infinity';
}

function escapeText(s: string): string {
  if (!/[\\\t\n\r]/.test(s)) return s;
  return s.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r'));
}

function arrayElement(v: string | number | null): string {
  if (v === null) return 'NULL';
  if (typeof v === 'number') return num(v);
  if (v === '' || /[{},"\\\s]/.test(v) || v.toUpperCase() === 'NULL') return '"' + v.replace(/["\\]/g, (c) => '\\' + c) + '"';
  return v;
}

/** An array literal `{a,b,…}` (before COPY escaping). */
export function arrayLiteral(values: ArrayLike<number> | readonly (string | number | null)[]): string {
  const n = values.length;
  if (n === 0) return '{}';
  if (ArrayBuffer.isView(values)) {
    const a = values as unknown as ArrayLike<number>;
    let s = '{' + num(a[0]);
    for (let i = 1; i < n; i++) s += ',' + num(a[i]);
    return s + '}';
  }
  const parts: string[] = new Array(n);
  for (let i = 0; i < n; i++) parts[i] = arrayElement((values as readonly (string | number | null)[])[i]);
  return '{' + parts.join(',') + '}';
}

/** One field of a COPY text row. */
export function copyField(v: CopyValue): string {
  if (v === null || v === undefined) return '\\N';
  switch (typeof v) {
    case 'number':
      return num(v);
    case 'bigint':
      return v.toString();
    case 'boolean':
      return v ? 't' : 'f';
    case 'string':
      return escapeText(v);
  }
  if (v instanceof Date) return v.toISOString();
  if (ArrayBuffer.isView(v) || Array.isArray(v)) return escapeText(arrayLiteral(v as ArrayLike<number>));
  return escapeText(JSON.stringify(v));
}

/** One COPY text row, newline included. */
export function copyLine(row: readonly unknown[]): string {
  let s = '';
  for (let i = 0; i < row.length; i++) {
    if (i > 0) s += '\t';
    s += copyField(row[i] as CopyValue);
  }
  return s + '\n';
}
