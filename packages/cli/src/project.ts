/**
 * The project folder: a `fractile.json` in the working folder names the database, the grade
 * catalog, the manifests with their column maps, and the output folder, so that every command run
 * there finds them without options (`fractile demo` writes one into
 * its output folder). Paths in it are relative to the file's folder. Options and $DATABASE_URL
 * come first: `--db` > `$DATABASE_URL` > `database` here > `./.fractile/db`.
 *
 *   {
 *     "database": "db",                        // folder of the embedded database, or postgres://…
 *     "catalog": "catalog.json",
 *     "manifests": ["data/manifest.csv", { "path": "data/mill-b.csv", "map": "maps/mill-b.json" }],
 *     "out": "fractile-out"
 *   }
 *
 * Every key is optional; an unknown key or a wrong type is an error naming its line and column.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { JsonSyntaxError, parseLocatedJson, type LocatedJson } from '@fractile/pipeline/json-located';
import { CliError } from './cli-error.ts';

export const PROJECT_FILE = 'fractile.json';

export interface ProjectManifest {
  path: string;
  map: string | null;
}

export interface Project {
  /** the project file, absolute */
  file: string;
  database?: string;
  catalog?: string;
  manifests?: ProjectManifest[];
  out?: string;
}

const KEYS = ['$comment', 'database', 'catalog', 'manifests', 'out'];

/** A fault in the project file, named by file, line and column (exit 2). */
export class ProjectError extends Error {
  readonly code = 'bad_project_file';
  constructor(
    message: string,
    readonly file: string,
    readonly line: number,
    readonly column: number,
  ) {
    super(message);
  }
}

const isUrl = (s: string) => /^[a-z][a-z0-9+.-]*:\/\//i.test(s);

/** Reads `fractile.json` of `folder` (default: the working folder); null when there is none. */
export function loadProject(folder = process.cwd()): Project | null {
  const file = resolve(folder, PROJECT_FILE);
  if (!existsSync(file)) return null;
  let doc: LocatedJson;
  try {
    doc = parseLocatedJson(readFileSync(file, 'utf8'));
  } catch (e) {
    if (e instanceof JsonSyntaxError) throw new ProjectError(e.message, file, e.line, e.column);
    throw new CliError(`cannot read ${file}: ${(e as Error).message}`);
  }
  const fail = (message: string, path: (string | number)[]): never => {
    const p = doc.at(path);
    throw new ProjectError(message, file, p.line, p.column);
  };
  const raw = doc.value;
  if (!raw || typeof raw !== 'object' || Array.isArray(raw)) fail('the project file must be a JSON object (keys: database, catalog, manifests, out)', []);
  const o = raw as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!KEYS.includes(k)) fail(`unknown key "${k}" (known: ${KEYS.slice(1).join(', ')})`, [k]);
  const base = dirname(file);
  const path = (v: string) => (isAbsolute(v) ? v : join(base, v));
  const text = (k: string): string | undefined => {
    if (o[k] === undefined) return undefined;
    if (typeof o[k] !== 'string' || !(o[k] as string).trim()) fail(`"${k}" must be a non-empty string (a path relative to this file)`, [k]);
    return o[k] as string;
  };
  const project: Project = { file };
  const database = text('database');
  if (database !== undefined) project.database = isUrl(database) ? database : path(database);
  const catalog = text('catalog');
  if (catalog !== undefined) project.catalog = path(catalog);
  const out = text('out');
  if (out !== undefined) project.out = path(out);
  if (o.manifests !== undefined) {
    if (!Array.isArray(o.manifests)) fail('"manifests" must be a list of paths or { "path", "map" } objects', ['manifests']);
    project.manifests = (o.manifests as unknown[]).map((m, i) => {
      if (typeof m === 'string' && m.trim()) return { path: path(m), map: null };
      if (m && typeof m === 'object' && !Array.isArray(m)) {
        const e = m as Record<string, unknown>;
        for (const k of Object.keys(e)) if (k !== 'path' && k !== 'map') fail(`unknown key "${k}" in manifests[${i}] (known: path, map)`, ['manifests', i, k]);
        if (typeof e.path !== 'string' || !e.path.trim()) fail(`manifests[${i}].path must be a non-empty string`, ['manifests', i]);
        if (e.map !== undefined && e.map !== null && (typeof e.map !== 'string' || !e.map.trim())) fail(`manifests[${i}].map must be a path or null`, ['manifests', i, 'map']);
        return { path: path(e.path as string), map: typeof e.map === 'string' ? path(e.map) : null };
      }
      return fail(`manifests[${i}] must be a path or a { "path", "map" } object`, ['manifests', i]);
    });
  }
  return project;
}
