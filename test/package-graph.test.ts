/**
 * The package graph is one-way and visible: every `@fractile/*` package a source file imports is
 * declared in that package's package.json, nothing declared goes unused, no file reaches into
 * another package by a relative path, and the declared graph has no cycle (each layer reads only
 * the ones below it). A rule of the project, checked on the sources themselves.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('..', import.meta.url));
const workspaces: string[] = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')).workspaces;

interface Pkg { dir: string; name: string; declared: string[]; imported: Map<string, string> }

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir)) {
    const p = join(dir, e);
    if (statSync(p).isDirectory()) out.push(...sourceFiles(p));
    else if (/\.m?[jt]s$/.test(e) && !/\.test\.ts$/.test(e)) out.push(p);
  }
  return out;
}

const IMPORT = /(?:from\s+|import\s*\(\s*|import\s+)['"](@fractile\/[a-z-]+)(?:\/[^'"]*)?['"]/g;
const RELATIVE = /(?:from\s+|import\s*\(\s*|import\s+)['"](\.{1,2}\/[^'"]+)['"]/g;

function readPackage(dir: string): Pkg & { escapes: string[] } {
  const json = JSON.parse(readFileSync(join(root, dir, 'package.json'), 'utf8'));
  const declared = Object.keys({ ...json.dependencies, ...json.peerDependencies }).filter((d) => d.startsWith('@fractile/'));
  const imported = new Map<string, string>();
  const escapes: string[] = [];
  const src = join(root, dir, 'src');
  for (const f of sourceFiles(src)) {
    const text = readFileSync(f, 'utf8');
    for (const m of text.matchAll(IMPORT)) if (!imported.has(m[1])) imported.set(m[1], relative(root, f));
    for (const m of text.matchAll(RELATIVE)) {
      const target = relative(join(root, dir), join(f, '..', m[1]));
      if (target.startsWith('..')) escapes.push(`${relative(root, f)} imports ${m[1]}`);
    }
  }
  return { dir, name: json.name, declared, imported, escapes };
}

const packages = workspaces.map(readPackage);

describe('the package graph', () => {
  it.each(packages.map((p) => [p.name, p] as const))('%s declares exactly the @fractile packages it imports', (_name, p) => {
    const imported = [...p.imported.keys()].filter((d) => d !== p.name).sort();
    expect(p.declared.slice().sort(), `imports: ${[...p.imported].map(([d, f]) => `${d} (${f})`).join(', ')}`).toEqual(imported);
  });

  it.each(packages.map((p) => [p.name, p] as const))('%s reaches no other package by a relative path', (_name, p) => {
    expect(p.escapes).toEqual([]);
  });

  it('has no cycle', () => {
    const deps = new Map(packages.map((p) => [p.name, p.declared]));
    const state = new Map<string, 'open' | 'done'>();
    const cycles: string[] = [];
    const visit = (n: string, path: string[]): void => {
      if (state.get(n) === 'done') return;
      if (state.get(n) === 'open') { cycles.push([...path, n].join(' → ')); return; }
      state.set(n, 'open');
      for (const d of deps.get(n) ?? []) visit(d, [...path, n]);
      state.set(n, 'done');
    };
    for (const n of deps.keys()) visit(n, []);
    expect(cycles).toEqual([]);
  });

  it('exports only files that exist', () => {
    for (const p of packages) {
      const json = JSON.parse(readFileSync(join(root, p.dir, 'package.json'), 'utf8'));
      for (const [key, target] of Object.entries<string>(json.exports ?? {})) {
        expect(() => statSync(join(root, p.dir, target)), `${p.name} exports ${key} → ${target}`).not.toThrow();
      }
    }
  });
});
