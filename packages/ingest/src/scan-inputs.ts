/**
 * The first pass over an ingest's inputs, before anything is written: each column map read and
 * validated once, each manifest hashed, its lines counted and checked to be UTF-8 (streaming,
 * manifest-reader.ts `scanFile`). What cannot be read becomes a whole-file rejection (line 0, or
 * the line of the first byte that is not UTF-8); a manifest whose column map is invalid is not
 * read at all.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type { ColumnMap } from './column-map.ts';
import { parseColumnMapText } from './column-map.ts';
import { NotUtf8Error, scanFile, type FileScan } from './manifest-reader.ts';
import { reject, type Rejection } from './rejection.ts';

export interface ManifestInput {
  path: string;
  /** column map for this manifest's curve files */
  map?: string | null;
}

export interface MapInfo {
  map: ColumnMap;
  sha256: string;
  size: number;
}

export interface ScannedManifest {
  input: ManifestInput;
  scan: FileScan;
  map: MapInfo | null;
}

export interface ScannedInputs {
  manifests: ScannedManifest[];
  rejected: Rejection[];
  /** data rows of the readable manifests (lines after the header), for progress */
  rows: number;
  /** settings recorded in the run row: each manifest and map with its hash */
  settings: { path: string; sha256: string | null; map: string | null; map_sha256: string | null }[];
}

const errCode = (e: unknown) => (e as { code?: string }).code ?? (e as Error).message;

function readMap(file: string): MapInfo | Rejection {
  let text: Buffer;
  try {
    text = readFileSync(file);
  } catch (e) {
    return reject(file, 0, 0, 'bad_column_map', `cannot read the column map (${errCode(e)})`);
  }
  const parsed = parseColumnMapText(text.toString('utf8'));
  if (!parsed.ok) return reject(file, 0, 0, 'bad_column_map', parsed.message);
  return { map: parsed.map, sha256: createHash('sha256').update(text).digest('hex'), size: text.length };
}

export async function scanInputs(inputs: ManifestInput[]): Promise<ScannedInputs> {
  const rejected: Rejection[] = [];
  const maps = new Map<string, MapInfo | null>();
  for (const m of inputs) {
    if (!m.map || maps.has(m.map)) continue;
    const r = readMap(m.map);
    if ('code' in r) rejected.push(r);
    maps.set(m.map, 'code' in r ? null : r);
  }
  const manifests: ScannedManifest[] = [];
  const settings: ScannedInputs['settings'] = [];
  for (const input of inputs) {
    const map = input.map ? maps.get(input.map)! : null;
    let scan: FileScan | null = null;
    if (input.map && map === null) rejected.push(reject(input.path, 0, 0, 'bad_column_map', `not read: its column map ${input.map} is invalid`));
    else {
      try {
        scan = await scanFile(input.path);
      } catch (e) {
        if (e instanceof NotUtf8Error) rejected.push(reject(input.path, e.line, 0, 'not_utf8', e.message));
        else rejected.push(reject(input.path, 0, 0, 'unreadable_file', `cannot read the manifest (${errCode(e)})`));
      }
    }
    if (scan) manifests.push({ input, scan, map });
    settings.push({ path: input.path, sha256: scan?.sha256 ?? null, map: input.map ?? null, map_sha256: map?.sha256 ?? null });
  }
  const rows = manifests.reduce((s, m) => s + Math.max(0, m.scan.lines - 1), 0);
  return { manifests, rejected, rows, settings };
}
