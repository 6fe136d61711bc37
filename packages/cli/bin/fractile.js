#!/usr/bin/env -S node --max-semi-space-size=2
// Entry point: loads the TypeScript sources through tsx, so no build step is needed after `npm ci`.
// A small young generation (2 MB semi-spaces) keeps a large embedded ingest under 400 MB peak
// RSS (measured 337–349 MB against 408–434 MB with V8's default on 10,000 tests × 2,000 points)
// and costs no time there.
import { register } from 'tsx/esm/api';

register();
await import('../src/main.ts');
