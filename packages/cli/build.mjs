// Compiles the `fractile` command to JavaScript (esbuild): packages/cli/dist/fractile.mjs, the
// reduce worker dist/reduce-worker.mjs and the ingest's curve worker dist/ingest-worker.mjs, with our workspace packages and the small pure-JavaScript
// registry packages (BUNDLED) bundled in, and every other package left to Node's own resolution. Code split at the dynamic
// imports, so `fractile --help` loads the command table and commander, not the database engine.
// Each source file keeps its own `import.meta.url`, so paths it resolves relative to itself
// (package.json versions, worker bootstraps, migrations folder) stay what they are in the sources.
//
// Runs as `npm run build` and in the root `prepare` step (after `npm ci`). dist/inputs.json
// records every input with its size and modification time; bin/fractile.js calls `isFresh()`
// before each start and rebuilds when a source changed, so editing the TypeScript needs no step.
//
// Plain JavaScript (no TypeScript loader needed to run it); esbuild is loaded only to build.
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const cliDir = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(cliDir, '../..');
export const DIST = path.join(cliDir, 'dist');
export const ENTRY = path.join(DIST, 'fractile.mjs');
const INPUTS = path.join(DIST, 'inputs.json');
const OWN = /^@fractile\//;
// Registry packages bundled in as well: plain JavaScript with no files of their own to find at
// run time, and many small modules (@stdlib alone is hundreds) whose resolution and loading cost
// more than the work of a read-only command. Everything else (the database engine and drivers,
// piscina, vega, tsx) stays external and is loaded by Node as the sources would load it. kysely
// and its PGlite dialect are bundled together, so that one copy of kysely is loaded.
const BUNDLED = /^(@stdlib\/|kysely$|kysely\/|kysely-pglite-dialect$|simple-statistics$|arquero$|acorn$|cli-progress$|commander$|csv-parse($|\/))/;

/** True when dist/ holds a build whose every input is unchanged (size and modification time). */
export function isFresh() {
  let list;
  try {
    list = JSON.parse(readFileSync(INPUTS, 'utf8'));
  } catch {
    return false;
  }
  if (list.root !== root || !Array.isArray(list.files)) return false;
  for (const [file, size, mtimeMs] of list.files) {
    try {
      const st = statSync(file);
      if (st.size !== size || st.mtimeMs !== mtimeMs) return false;
    } catch {
      return false;
    }
  }
  return true;
}

/** esbuild plugin: our files keep their own import.meta.url; other packages stay external. */
const sources = {
  name: 'fractile-sources',
  setup(b) {
    b.onResolve({ filter: /^[^./]/ }, (args) => {
      if (OWN.test(args.path) || BUNDLED.test(args.path) || args.path.startsWith('node:')) return undefined;
      return { path: args.path, external: true };
    });
    b.onLoad({ filter: /\.(ts|mjs)$/ }, (args) => {
      if (args.path.includes(`${path.sep}node_modules${path.sep}`)) return undefined;
      const text = readFileSync(args.path, 'utf8').replace(/\bimport\.meta\.url\b/g, JSON.stringify(pathToFileURL(args.path).href));
      return { contents: text, loader: args.path.endsWith('.ts') ? 'ts' : 'js' };
    });
  },
};

/** Writes a file through a temporary name, so a concurrent reader sees the old or the new one. */
function put(file, contents) {
  mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.tmp`;
  writeFileSync(tmp, contents);
  renameSync(tmp, file);
}

/**
 * Builds dist/; returns the seconds it took. Outputs are written before inputs.json; chunks of
 * an earlier build are left for processes still running from it unless `clean` is set.
 */
export async function build({ clean = false } = {}) {
  const t0 = performance.now();
  const { build: esbuild } = await import('esbuild');
  const started = Date.now();
  // registry packages are covered by the lock file (an install changes it), not file by file
  const configFiles = [path.join(root, 'package.json'), path.join(root, 'package-lock.json'), path.join(root, 'tsconfig.json'), fileURLToPath(import.meta.url)];
  for (const p of ['curves', 'stats', 'store', 'ingest', 'pipeline', 'report', 'cli']) configFiles.push(path.join(root, 'packages', p, 'package.json'));
  configFiles.push(path.join(root, 'seed-demo', 'package.json'));
  const result = await esbuild({
    absWorkingDir: root,
    entryPoints: {
      fractile: path.join(cliDir, 'src/main.ts'),
      'reduce-worker': path.join(root, 'packages/pipeline/src/reduce/worker.ts'),
      'ingest-worker': path.join(root, 'packages/ingest/src/curve-worker.ts'),
    },
    outdir: DIST,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    metafile: true,
    write: false,
    logLevel: 'silent',
    // bundled CommonJS packages require Node's built-in modules through this
    banner: { js: "import { createRequire as __fractileRequire } from 'node:module'; const require = __fractileRequire(import.meta.url);" },
    define: {
      FRACTILE_REDUCE_WORKER: JSON.stringify(pathToFileURL(path.join(DIST, 'reduce-worker.mjs')).href),
      FRACTILE_INGEST_WORKER: JSON.stringify(pathToFileURL(path.join(DIST, 'ingest-worker.mjs')).href),
    },
    plugins: [sources],
  });
  // a file changed since the build started is recorded as unknown (-1): the next start rebuilds
  const inputs = [...Object.keys(result.metafile.inputs).filter((f) => !f.includes('node_modules/')).map((f) => path.resolve(root, f)), ...configFiles];
  const files = inputs.map((f) => { const st = statSync(f); return [f, st.size, st.mtimeMs > started ? -1 : st.mtimeMs]; });
  const entry = result.outputFiles.find((o) => o.path === ENTRY);
  if (clean) rmSync(DIST, { recursive: true, force: true });
  for (const o of result.outputFiles) if (o !== entry) put(o.path, o.contents);
  put(ENTRY, entry.contents);
  put(INPUTS, JSON.stringify({ root, builtAt: new Date().toISOString(), files }));
  return (performance.now() - t0) / 1000;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const s = await build({ clean: true });
  process.stderr.write(`fractile: compiled the command line into ${path.relative(root, DIST)} in ${s.toFixed(2)} s\n`);
}
