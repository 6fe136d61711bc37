// Worker-thread bootstrap when running from the TypeScript sources: worker threads do not inherit
// the parent's TypeScript loader, so register it here and load the TypeScript entry. The
// compiled command line runs its compiled copy (dist/ingest-worker.mjs) instead.
import { register } from 'tsx/esm/api';

register();
const mod = await import('./curve-worker.ts');
export default mod.default;
