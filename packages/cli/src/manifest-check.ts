/**
 * Checks the files handed to `ingest` before any database is opened, so that a wrong path creates
 * nothing (exit 2): each must exist and be a file, and a curve file given in place of a manifest is
 * named as such. A curve file is recognised by its first lines: no `test_id` column, and either
 * channel names (time, force, extension, strain, stress) in the header or a first data row of
 * numbers only. Anything else goes to the ingest reader, which names every fault by line and
 * column and records it.
 */
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { CliError } from './cli-error.ts';

const CHANNEL = /^(time|t|force|load|f|extension|elongation|displacement|strain|stress|position|crosshead)\b/i;

/** The first `bytes` of a file as text. */
function head(path: string, bytes = 4096): string {
  const fd = openSync(path, 'r');
  try {
    const buf = Buffer.alloc(bytes);
    const n = readSync(fd, buf, 0, bytes, 0);
    return buf.subarray(0, n).toString('utf8');
  } finally {
    closeSync(fd);
  }
}

const cells = (line: string) => line.split(/[,;\t]/).map((c) => c.trim().replace(/^"|"$/g, ''));

/** True when the text's first lines read as a test curve rather than a manifest. */
export function looksLikeCurve(text: string): boolean {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() && !l.startsWith('#'));
  if (lines.length === 0) return false;
  const header = cells(lines[0]).map((c) => c.replace(/\s*\[.*\]\s*$/, '').toLowerCase());
  if (header.includes('test_id')) return false;
  const numeric = (l: string) => cells(l).every((c) => c !== '' && Number.isFinite(Number(c.replace(',', '.'))));
  if (numeric(lines[0])) return true;
  return header.some((c) => CHANNEL.test(c)) && lines.length > 1 && numeric(lines[1]);
}

export function checkManifestFiles(paths: readonly string[]): void {
  for (const p of paths) {
    let isFile = false;
    try {
      isFile = statSync(p).isFile();
    } catch {
      throw new CliError(`no manifest at ${p}: nothing was ingested and no database was created`);
    }
    if (!isFile) throw new CliError(`${p} is not a file: \`fractile ingest\` takes manifest CSV files (one row per test)`);
    if (looksLikeCurve(head(p)))
      throw new CliError(
        `${p} looks like a curve file (columns of measured channels), not a manifest: write a manifest with one row per test whose "curve" column names this file, and pass the manifest (README "Your own data")`,
      );
  }
}
