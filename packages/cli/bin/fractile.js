#!/usr/bin/env -S node --max-semi-space-size=2
// Entry point. Runs the command line compiled to JavaScript (packages/cli/dist, built at `npm ci`
// by the `prepare` step or by `npm run build`), after rebuilding it when a source file changed
// since (about 1 s, once); runs the TypeScript sources through tsx instead when it cannot be
// built, or when FRACTILE_FROM_SOURCES=1.
// 2 MB V8 semi-spaces keep a large embedded ingest under 400 MB peak RSS (337–349 MB against
// 408–434 MB with V8's default on 10,000 tests × 2,000 points) and, with the allocation-free law
// fits, no longer cost the reduction time (see README, Benchmarks).
import { pathToFileURL } from 'node:url';
import { build, ENTRY, isFresh } from '../build.mjs';

let compiled = process.env.FRACTILE_FROM_SOURCES !== '1';
if (compiled && !isFresh()) {
  try {
    await build();
  } catch (e) {
    compiled = false;
    process.stderr.write(`fractile: could not compile the command line (${e instanceof Error ? e.message.split('\n')[0] : String(e)}); running from the TypeScript sources\n`);
  }
}
if (compiled) {
  await import(pathToFileURL(ENTRY).href);
} else {
  const { register } = await import('tsx/esm/api');
  register();
  await import('../src/main.ts');
}
