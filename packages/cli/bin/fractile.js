#!/usr/bin/env node
// Entry point: loads the TypeScript sources through tsx, so no build step is needed after `npm ci`.
import { register } from 'tsx/esm/api';

register();
await import('../src/main.ts');
