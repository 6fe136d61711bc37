/**
 * A small streaming CSV writer (RFC 4180 quoting: a field holding a comma, quote or line break
 * is quoted, quotes doubled). Written by hand: rows go straight to a file descriptor, one
 * synchronous write per row, so a manifest of any length never sits in memory.
 */
import { closeSync, openSync, writeSync } from 'node:fs';

export type Cell = string | number | null | undefined;

export function csvField(v: Cell): string {
  if (v === null || v === undefined) return '';
  const s = typeof v === 'number' ? String(v) : v;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function csvLine(cells: readonly Cell[]): string {
  return cells.map(csvField).join(',') + '\n';
}

export class CsvFileWriter {
  private fd: number;
  /** lines written so far, the header included (so the next row is on line `lines + 1`) */
  lines = 0;
  constructor(
    readonly path: string,
    readonly header: readonly string[],
  ) {
    this.fd = openSync(path, 'w');
    this.write(header);
  }
  write(cells: readonly Cell[]): number {
    writeSync(this.fd, csvLine(cells));
    return ++this.lines;
  }
  close(): void {
    closeSync(this.fd);
  }
}
