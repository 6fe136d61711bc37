/**
 * One CSV export file in the shared shape (export-format.ts): with the documented comment block,
 * or plain with its sidecar `<file>.provenance.json` (`comments: false`, for spreadsheet import).
 * Returns the paths written.
 */
import { writeFileSync } from 'node:fs';
import { csvCommentBlock, csvSidecar, csvTable, sidecarName, type Row } from './export-format.ts';

export interface CsvFileSpec {
  kind: string;
  title: string;
  rows: readonly Row[];
  columns?: readonly string[];
  notes?: Readonly<Record<string, string>>;
  provenance: Record<string, unknown>;
  /** comment block above the table (default), or plain with a sidecar */
  comments?: boolean;
  /** significant digits of numbers (export-format.ts default 6) */
  digits?: number;
}

export function writeCsvFile(path: string, spec: CsvFileSpec): string[] {
  const body = csvTable(spec.rows, spec.columns, spec.digits);
  if (spec.comments !== false) {
    writeFileSync(path, csvCommentBlock(spec.title, spec.provenance, spec.notes) + body);
    return [path];
  }
  writeFileSync(path, body);
  writeFileSync(sidecarName(path), csvSidecar(spec.kind, spec.title, spec.provenance, spec.notes));
  return [path, sidecarName(path)];
}
